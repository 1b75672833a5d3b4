"""The graph layer: class-group structure as networkx graphs, their export and pictures.

* :mod:`~formkit.graphs.construction` — Cayley graphs of Cl(D), cycle graphs of ρ, fibre
  graphs of Cl(D) → Cl(d_K), and reading the structure back from them;
* :mod:`~formkit.graphs.results` — the graph classes returned (networkx's, with a readable
  ``repr`` and notebook displays: the picture inline);
* :mod:`~formkit.graphs.labels` — node keys, genus signs and titles;
* :mod:`~formkit.graphs.colours` — one colour per genus and per prime;
* :mod:`~formkit.graphs.export` — node-link JSON, GraphML and DOT text;
* :mod:`~formkit.graphs.plotting` — layout and PNG/SVG pictures (matplotlib, optional).

Importing this package imports networkx; :mod:`formkit` loads it on first use of one of
the names below.  This layer imports :mod:`formkit.core`, :mod:`formkit.classgroups` and
:mod:`formkit.errors`.
"""

from .construction import *  # noqa: F403
from .construction import __all__ as _construction_all
from .export import *  # noqa: F403
from .export import __all__ as _export_all
from .labels import *  # noqa: F403
from .labels import __all__ as _labels_all
from .results import *  # noqa: F403
from .results import __all__ as _results_all

__all__ = [*_construction_all, *_labels_all, *_export_all, *_results_all]
