"""formkit: binary quadratic forms, class groups and representations, exactly.

The public API is re-exported here from one subpackage per layer; imports run only
down the layers (``tests/test_layers.py`` checks it):

* :mod:`formkit.errors` — the ``FormkitError`` family;
* :mod:`formkit.core` — integers, forms, discriminants, reduction, equivalence,
  composition, enumeration;
* :mod:`formkit.analytic` — L(1, χ_D) with its GRH interval, the class number formula,
  lattice-point averages, j(τ); certified L(s, χ_D), ζ(s), η, Epstein zeta functions and
  theta series;
* :mod:`formkit.classgroups` — ``ClassGroup`` and its methods, genera, orders; series over
  the classes (ζ_K, class group and genus characters, Chowla–Selberg, Siegel's genus average);
* :mod:`formkit.representation` — representations, orbits, Cornacchia, class
  polynomials, prime criteria;
* :mod:`formkit.graphs`, :mod:`formkit.tables`, :mod:`formkit.explain` — graphs, tables
  and worked examples;
* :mod:`formkit.cli` — the ``formkit`` command.

See each module's docstring for what it covers and which references it follows.
"""

import sys as _sys

# Values in this library (fundamental units, huge discriminants) routinely exceed
# Python's default limit of 4300 digits for int <-> str conversion; lift it so that
# printing and parsing exact results never fails.
if hasattr(_sys, "set_int_max_str_digits"):
    _sys.set_int_max_str_digits(0)

from ._version import __version__
from .analytic import *  # noqa: F403
from .analytic import __all__ as _analytic_all
from .classgroups import *  # noqa: F403
from .classgroups import __all__ as _classgroups_all
from .core import *  # noqa: F403
from .core import __all__ as _core_all
from .errors import *  # noqa: F403
from .errors import __all__ as _errors_all
from .explain import *  # noqa: F403
from .explain import __all__ as _explain_all
from .representation import *  # noqa: F403
from .representation import __all__ as _representation_all
from .tables import *  # noqa: F403
from .tables import __all__ as _tables_all

# The graph layer needs networkx, which takes a noticeable time to import; its names
# are loaded on first use (PEP 562) so that `import formkit` and the CLI stay quick.
# tests/test_package.py checks that this list equals formkit.graphs.__all__.
_graphs_all = [
    "usable_primes",
    "generating_primes",
    "cayley_graph_cost",
    "cayley_graph",
    "cycle_graph",
    "fibre_graph",
    "generated_subgroup",
    "cycle_lengths",
    "prime_orders",
    "edge_count",
    "genus_label",
    "node_label",
    "form_label",
    "graph_to_json",
    "graph_from_json",
    "graph_to_graphml",
    "graph_to_dot",
    "graph_title",
    "GRAPH_KINDS",
    "CayleyGraph",
    "CycleGraph",
    "FibreGraph",
]

__all__ = [
    *_errors_all,
    *_core_all,
    *_analytic_all,
    *_classgroups_all,
    *_representation_all,
    *_tables_all,
    *_explain_all,
    *_graphs_all,
    "__version__",
]


def __getattr__(name: str):
    if name in _graphs_all:
        from . import graphs

        value = getattr(graphs, name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'formkit' has no attribute {name!r}")


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(_graphs_all))
