"""The analytic layer: class numbers and L-values from analysis, as independent checks.

* :mod:`~formkit.analytic.lseries` — L(1, χ_D) by a truncated Euler product with an
  explicit error interval under GRH, the class-number interval and proven upper bound
  that the large-discriminant class-group methods rely on;
* :mod:`~formkit.analytic.class_number_formula` — h(D) from Dirichlet's class number
  formula as finite character sums;
* :mod:`~formkit.analytic.averages` — lattice-point counts N_Q(X) beside 2πX/√|D|;
* :mod:`~formkit.analytic.j_function` — the modular invariant j(τ) (for class polynomials);
* :mod:`~formkit.analytic.balls` — exact arguments and certified values in ball arithmetic;
* :mod:`~formkit.analytic.l_series` — L(s, χ_D) and ζ(s) at any complex s, certified, and
  their exact values at s = 0, −1, −2, … (generalised Bernoulli numbers, in
  :mod:`~formkit.analytic.special_values`; the series summed with its tail bound and Taylor
  blocks in :mod:`~formkit.analytic.theta_split_series`);
* :mod:`~formkit.analytic.eta` — Dedekind's η(τ), certified;
* :mod:`~formkit.analytic.epstein` — the Epstein zeta function Z_Q(s) of a positive definite
  form (Chowla–Selberg expansion) and Kronecker's first limit formula;
* :mod:`~formkit.analytic.theta_series` — θ_Q = Σ r_Q(n) qⁿ of one positive definite form;
* :mod:`~formkit.analytic.local_densities` — the local densities α_p(n) of a binary form and
  Siegel's formula for the genus average, for every D < 0 (orders included).

Floating point appears here only with a stated precision and a verification step.
This layer imports only :mod:`formkit.core` and :mod:`formkit.errors`; the names below
are re-exported by :mod:`formkit`.
"""

from .averages import *  # noqa: F403
from .averages import __all__ as _averages_all
from .balls import *  # noqa: F403
from .balls import __all__ as _balls_all
from .class_number_formula import *  # noqa: F403
from .class_number_formula import __all__ as _formula_all
from .epstein import *  # noqa: F403
from .epstein import __all__ as _epstein_all
from .eta import *  # noqa: F403
from .eta import __all__ as _eta_all
from .j_function import *  # noqa: F403
from .j_function import __all__ as _j_all
from .k0_mellin import *  # noqa: F403
from .k0_mellin import __all__ as _k0_mellin_all
from .l_series import *  # noqa: F403
from .l_series import __all__ as _l_series_all
from .local_densities import *  # noqa: F403
from .local_densities import __all__ as _local_densities_all
from .lseries import *  # noqa: F403
from .lseries import __all__ as _lseries_all
from .special_values import *  # noqa: F403
from .special_values import __all__ as _special_values_all
from .theta_series import *  # noqa: F403
from .theta_series import __all__ as _theta_all

__all__ = [
    *_formula_all,
    *_averages_all,
    *_lseries_all,
    *_j_all,
    *_balls_all,
    *_l_series_all,
    *_k0_mellin_all,
    *_special_values_all,
    *_eta_all,
    *_epstein_all,
    *_theta_all,
    *_local_densities_all,
]
