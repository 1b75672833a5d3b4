"""The ground layer: integers, forms and the operations on them that everything else uses.

* :mod:`~formkit.core.arith` — the integer backend (the one module that talks to gmpy2);
* :mod:`~formkit.core.modular_roots` — square roots modulo n, the Chinese remainder theorem;
* :mod:`~formkit.core.parse` — the hand-written text parser for forms and integers;
* :mod:`~formkit.core.forms` — the ``Form`` value type and 2×2 integer matrices;
* :mod:`~formkit.core.discriminants` — discriminants, conductors, χ_D, units, regulators;
* :mod:`~formkit.core.quadratic_orders` — the ``Order`` value, numbers of Q(√m), and the
  text of discriminants, fields ``Q(√m)`` and conductors (``parse_discriminant``);
* :mod:`~formkit.core.quadratic_numbers` — exact numbers ``(x + y√D)/(2z)`` of the field;
* :mod:`~formkit.core.ideals` — invertible ideals, the dictionary forms ↔ ideals, prime
  ideals above p, factorisation;
* :mod:`~formkit.core.principal_ideals` — principality with a generator, compact
  representations of huge generators;
* :mod:`~formkit.core.raw_reduction` — the reduction loops on bare integer triples;
* :mod:`~formkit.core.reduction` — reduction of definite and indefinite forms, ρ, cycles;
* :mod:`~formkit.core.equivalence` — proper and improper equivalence, automorphisms;
* :mod:`~formkit.core.composition` — Dirichlet composition, NUCOMP and NUDUPL;
* :mod:`~formkit.core.enumeration` — all reduced forms of D, class numbers by listing, the
  reduced prime forms of the small primes;
* :mod:`~formkit.core.polynomials_mod_p` — root counts and squarefreeness modulo a prime;
* :mod:`~formkit.core.lattice` — Hermite and Smith normal forms with transformations and
  quotients Zⁿ/L of integer lattices (python-flint's integer matrices);
* :mod:`~formkit.core.sparse_elimination` — structured Gaussian elimination of sparse
  relation matrices on unit pivots (used by ``lattice``);
* :mod:`~formkit.core.modular_hermite` — Hermite forms of tall matrices through a
  sublattice, its determinant and a membership test (used by ``lattice``);
* :mod:`~formkit.core.abelian_quotient` — the group Zⁿ/L of a relation lattice:
  invariants, generators, coordinates (importable from ``lattice``);
* :mod:`~formkit.core.smith_diagonal` — the Smith form with its column transformation from
  a Hermite form; :mod:`~formkit.core.matrix_input` — reading dense, sparse or FLINT matrices;
* :mod:`~formkit.core.progress` — progress bars and phase lines on stderr for long jobs
  (one switch for all of them; the command line's ``--quiet``).

This layer imports nothing from formkit but :mod:`formkit.errors` (and, from outside,
gmpy2, sympy and python-flint for arithmetic).  The names below are
re-exported by :mod:`formkit`; the integer backend, the parser and the raw reduction
loops are used by every layer but are not part of the top-level API.
"""

from .composition import *  # noqa: F403
from .composition import __all__ as _composition_all
from .discriminants import *  # noqa: F403
from .discriminants import __all__ as _discriminants_all
from .enumeration import *  # noqa: F403
from .enumeration import __all__ as _enumeration_all
from .equivalence import *  # noqa: F403
from .equivalence import __all__ as _equivalence_all
from .forms import *  # noqa: F403
from .forms import __all__ as _forms_all
from .ideals import *  # noqa: F403
from .ideals import __all__ as _ideals_all
from .lattice import *  # noqa: F403
from .lattice import __all__ as _lattice_all
from .polynomials_mod_p import *  # noqa: F403
from .polynomials_mod_p import __all__ as _polynomials_all
from .principal_ideals import *  # noqa: F403
from .principal_ideals import __all__ as _principal_ideals_all
from .quadratic_numbers import *  # noqa: F403
from .quadratic_numbers import __all__ as _quadratic_numbers_all
from .quadratic_orders import *  # noqa: F403
from .quadratic_orders import __all__ as _quadratic_orders_all
from .reduction import *  # noqa: F403
from .reduction import __all__ as _reduction_all

__all__ = [
    *_forms_all,
    *_discriminants_all,
    *_reduction_all,
    *_equivalence_all,
    *_composition_all,
    *_enumeration_all,
    *_polynomials_all,
    *_quadratic_numbers_all,
    *_quadratic_orders_all,
    *_ideals_all,
    *_principal_ideals_all,
    *_lattice_all,
]
