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
* :mod:`~formkit.classgroups.orders` — orders of conductor f: Cl(D) → Cl(d_K), the class
  number formula for orders.

This layer imports :mod:`formkit.core`, :mod:`formkit.analytic` and :mod:`formkit.errors`;
the names below are re-exported by :mod:`formkit`.
"""

from .baby_step_giant_step import *  # noqa: F401,F403
from .baby_step_giant_step import __all__ as _bsgs_all
from .genus import *  # noqa: F401,F403
from .genus import __all__ as _genus_all
from .group import *  # noqa: F401,F403
from .group import __all__ as _group_all
from .infrastructure import *  # noqa: F401,F403
from .infrastructure import __all__ as _infrastructure_all
from .orders import *  # noqa: F401,F403
from .orders import __all__ as _orders_all

__all__ = [*_group_all, *_genus_all, *_orders_all, *_bsgs_all, *_infrastructure_all]
