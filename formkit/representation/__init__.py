"""The representation layer: which integers and primes a form represents, and how.

* :mod:`~formkit.representation.square_root_method` — the steps both kinds of form share;
* :mod:`~formkit.representation.representations` — r_Q(n), primitive counts and all
  solutions of Q(x, y) = n (definite forms), sums over classes;
* :mod:`~formkit.representation.orbits` — one solution per orbit of the automorphs
  (indefinite forms);
* :mod:`~formkit.representation.cornacchia` — does Q represent the prime p, and how
  (reduction of (p, b, ·), Cornacchia's algorithm);
* :mod:`~formkit.representation.class_polynomials` — Hilbert and ring class polynomials
  from j-invariants, verified;
* :mod:`~formkit.representation.class_invariants` — Weber class polynomials (the same
  ring class field, much smaller coefficients), with
  :mod:`~formkit.representation.weber_even` for the discriminants ``D = −4m``;
* :mod:`~formkit.representation.double_eta` — class polynomials of double η-quotients,
  with :mod:`~formkit.representation.double_eta_modular` for their modular polynomials
  ``Ψ(w^s, j) = 0`` (the step to ``j``);
* :mod:`~formkit.representation.cm_method` — roots of class polynomials modulo a prime and
  the elliptic curves with complex multiplication they give;
* :mod:`~formkit.representation.prime_decision` — does Q represent the prime p (the class
  of the prime form decides); primes up to a bound;
* :mod:`~formkit.representation.genus_congruences` — the values of a genus modulo |D|, one
  class per genus, idoneal numbers;
* :mod:`~formkit.representation.prime_criteria` — which primes a form represents, in
  words: congruences, class polynomials, densities.

The function :func:`formkit.representations` shares its name with the module above;
``formkit.representation.representations`` is the function too (as are
``formkit.representation.cornacchia`` and ``formkit.core.equivalence``): import the
modules with ``from formkit.representation.representations import …``.

This layer imports :mod:`formkit.core`, :mod:`formkit.analytic`,
:mod:`formkit.classgroups` and :mod:`formkit.errors`; the names below are re-exported by
:mod:`formkit`.
"""

from .class_invariants import *  # noqa: F403
from .class_invariants import __all__ as _class_invariants_all
from .class_polynomials import *  # noqa: F403
from .class_polynomials import __all__ as _class_polynomials_all
from .cm_method import *  # noqa: F403
from .cm_method import __all__ as _cm_method_all
from .cornacchia import *  # noqa: F403
from .cornacchia import __all__ as _cornacchia_all
from .double_eta import *  # noqa: F403
from .double_eta import __all__ as _double_eta_all
from .double_eta_modular import *  # noqa: F403
from .double_eta_modular import __all__ as _double_eta_modular_all
from .genus_congruences import *  # noqa: F403
from .genus_congruences import __all__ as _genus_congruences_all
from .orbits import *  # noqa: F403
from .orbits import __all__ as _orbits_all
from .prime_criteria import *  # noqa: F403
from .prime_criteria import __all__ as _prime_criteria_all
from .prime_decision import *  # noqa: F403
from .prime_decision import __all__ as _prime_decision_all
from .representations import *  # noqa: F403
from .representations import __all__ as _representations_all

__all__ = [
    *_representations_all,
    *_orbits_all,
    *_cornacchia_all,
    *_class_polynomials_all,
    *_class_invariants_all,
    *_double_eta_all,
    *_double_eta_modular_all,
    *_cm_method_all,
    *_prime_decision_all,
    *_genus_congruences_all,
    *_prime_criteria_all,
]
