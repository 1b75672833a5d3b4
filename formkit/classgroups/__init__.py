"""The class-group layer: Cl(D) as an object, the methods that compute it, genera, orders.

* :mod:`~formkit.classgroups.group` — the types: ``ClassGroup``, ``ClassGroupElement``
  and ``Provenance`` (how a result was obtained);
* :mod:`~formkit.classgroups.genus` — assigned characters, genus symbols, genera;
* :mod:`~formkit.classgroups.abelian_groups` — orders, Sylow bases and structure of a
  finite abelian group given by its operations (shared by the methods below);
* the methods, each importing only the types and lower layers:
  :mod:`~formkit.classgroups.enumerated` (complete enumeration, unconditional),
  :mod:`~formkit.classgroups.baby_step_giant_step` (D < 0 beyond enumeration, GRH),
  :mod:`~formkit.classgroups.infrastructure` (D > 0 beyond enumeration, GRH);
* :mod:`~formkit.classgroups.dispatch` — ``class_group(D)``: chooses the method by size;
* :mod:`~formkit.classgroups.orders` — orders of conductor f: Cl(D) → Cl(d_K), the class
  number formula for orders;
* :mod:`~formkit.classgroups.principal_genus_theorem` — Gauss's theorem checked on Cl(D);
* :mod:`~formkit.classgroups.class_series` — Dirichlet series over the classes: Σ Z_C = w·ζ_K,
  L-series of class group (ring class) and genus characters, the Chowla–Selberg formula;
* :mod:`~formkit.classgroups.order_series` — the same series for orders (conductor f > 1):
  Σ Z_C = w·ζ_K·∏_{p|f} e_p, ring class and genus characters of orders, the factors at p | f;
* :mod:`~formkit.classgroups.genus_theta` — genus theta series, Siegel's weighted average, its
  Eisenstein series from the genus characters, the cusp part;
* :mod:`~formkit.classgroups.partial_zeta` (continued by :mod:`~formkit.classgroups.partial_zeta_continuation`) — partial zeta functions ζ(s, C) of the narrow classes
  of D > 0, Σ_C ζ(s, C) = ζ_K(s), narrow class and genus character L-series for D > 0;
* :mod:`~formkit.classgroups.hecke_theta` — Hecke operators on the theta series of D, their
  eigenforms, the cusp part as a sum of eigenforms.

This layer imports :mod:`formkit.core`, :mod:`formkit.analytic` and :mod:`formkit.errors`;
the names below are re-exported by :mod:`formkit`.
"""

from .baby_step_giant_step import *  # noqa: F403
from .baby_step_giant_step import __all__ as _bsgs_all
from .class_series import *  # noqa: F403
from .class_series import __all__ as _class_series_all
from .dispatch import *  # noqa: F403
from .dispatch import __all__ as _dispatch_all
from .genus import *  # noqa: F403
from .genus import __all__ as _genus_all
from .genus_theta import *  # noqa: F403
from .genus_theta import __all__ as _genus_theta_all
from .group import *  # noqa: F403
from .group import __all__ as _group_all
from .hecke_theta import *  # noqa: F403
from .hecke_theta import __all__ as _hecke_theta_all
from .infrastructure import *  # noqa: F403
from .infrastructure import __all__ as _infrastructure_all
from .order_series import *  # noqa: F403
from .order_series import __all__ as _order_series_all
from .orders import *  # noqa: F403
from .orders import __all__ as _orders_all
from .partial_zeta import *  # noqa: F403
from .partial_zeta import __all__ as _partial_zeta_all
from .partial_zeta_continuation import *  # noqa: F403
from .partial_zeta_continuation import __all__ as _continuation_all
from .principal_genus_theorem import *  # noqa: F403
from .principal_genus_theorem import __all__ as _theorem_all

__all__ = [
    *_group_all,
    *_dispatch_all,
    *_genus_all,
    *_theorem_all,
    *_orders_all,
    *_bsgs_all,
    *_infrastructure_all,
    *_class_series_all,
    *_order_series_all,
    *_genus_theta_all,
    *_hecke_theta_all,
    *_partial_zeta_all,
    *_continuation_all,
]
