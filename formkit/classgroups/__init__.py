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
* the series over the classes, bottom first:
  :mod:`~formkit.classgroups.series_identity` (the result type of an identity checked two
  ways), :mod:`~formkit.classgroups.genus_characters` (the splittings D = d₁·d₂ of the genus
  characters), :mod:`~formkit.classgroups.narrow_class_zeta` (partial zeta functions ζ(s, C)
  of the narrow classes of D > 0, continued by
  :mod:`~formkit.classgroups.partial_zeta_continuation`),
  :mod:`~formkit.classgroups.class_character_series` (L-series of class group characters,
  D < 0 and D > 0, every order), :mod:`~formkit.classgroups.conductor_factors` (the factors
  e_p at p | f of an order), :mod:`~formkit.classgroups.order_series` (Σ Z_C = w·ζ_K·∏ e_p,
  ring class and genus characters of orders), then
  :mod:`~formkit.classgroups.class_series` (D < 0: Σ Z_C = w·ζ_K, genus characters, the
  Chowla–Selberg formula) and :mod:`~formkit.classgroups.partial_zeta` (D > 0: Σ_C ζ(s, C)
  = ζ_K(s), genus characters); these two hand a non-fundamental D to ``order_series``;
* :mod:`~formkit.classgroups.genus_theta` — genus theta series, Siegel's weighted average, its
  Eisenstein series from the genus characters, the cusp part;
* :mod:`~formkit.classgroups.hecke_theta` — Hecke operators on the theta series of D, their
  eigenforms, the cusp part as a sum of eigenforms (the matrices of T_p proved by Sturm's
  bound in :mod:`~formkit.classgroups.hecke_operators`, the eigenvalue fields Q[x]/(g) in
  :mod:`~formkit.classgroups.number_fields`).

This layer imports :mod:`formkit.core`, :mod:`formkit.analytic` and :mod:`formkit.errors`;
the names below are re-exported by :mod:`formkit`.
"""

from .baby_step_giant_step import *  # noqa: F403
from .baby_step_giant_step import __all__ as _bsgs_all
from .class_character_series import *  # noqa: F403
from .class_character_series import __all__ as _class_character_series_all
from .class_series import *  # noqa: F403
from .class_series import __all__ as _class_series_all
from .conductor_factors import *  # noqa: F403
from .conductor_factors import __all__ as _conductor_factors_all
from .dispatch import *  # noqa: F403
from .dispatch import __all__ as _dispatch_all
from .genus import *  # noqa: F403
from .genus import __all__ as _genus_all
from .genus_characters import *  # noqa: F403
from .genus_characters import __all__ as _genus_characters_all
from .genus_theta import *  # noqa: F403
from .genus_theta import __all__ as _genus_theta_all
from .group import *  # noqa: F403
from .group import __all__ as _group_all
from .hecke_operators import *  # noqa: F403
from .hecke_operators import __all__ as _hecke_operators_all
from .hecke_theta import *  # noqa: F403
from .hecke_theta import __all__ as _hecke_theta_all
from .infrastructure import *  # noqa: F403
from .infrastructure import __all__ as _infrastructure_all
from .narrow_class_zeta import *  # noqa: F403
from .narrow_class_zeta import __all__ as _narrow_class_zeta_all
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
from .series_identity import *  # noqa: F403
from .series_identity import __all__ as _series_identity_all

__all__ = [
    *_group_all,
    *_dispatch_all,
    *_genus_all,
    *_theorem_all,
    *_orders_all,
    *_bsgs_all,
    *_infrastructure_all,
    *_series_identity_all,
    *_genus_characters_all,
    *_narrow_class_zeta_all,
    *_class_character_series_all,
    *_conductor_factors_all,
    *_class_series_all,
    *_order_series_all,
    *_genus_theta_all,
    *_hecke_operators_all,
    *_hecke_theta_all,
    *_partial_zeta_all,
    *_continuation_all,
]
