"""The table layer: class numbers and class groups over ranges of discriminants.

* :mod:`~formkit.tables.display` — the list of rows returned, with notebook displays;
* :mod:`~formkit.tables.rows` — table rows, chunks of a range, :func:`table_rows` and
  :func:`class_numbers`;
* :mod:`~formkit.tables.sweep` — the sweeps that count reduced forms for a whole chunk of
  negative discriminants at once (numpy and pure Python);
* :mod:`~formkit.tables.store` — the resumable SQLite file, and reading it back;
* :mod:`~formkit.tables.parallel` — building a store on all cores or a Dask cluster;
* :mod:`~formkit.tables.theta` — Hurwitz class numbers and ``h(D)`` from the theta
  series of three squares (``r₃(n) = 12(H(4n) − 2H(n))``);
* :mod:`~formkit.tables.hurwitz_relation` — ``H(n)`` for ``n ≡ 7 (mod 8)`` from the
  Kronecker–Hurwitz class number relation (the third the theta series leaves open);
* :mod:`~formkit.tables.structure` — class-group invariants from the known ``h``;
* :mod:`~formkit.tables.four_rank` — the 4-rank from the ambiguous forms and the genus
  characters (the 2-part the structure rarely has to build);
* :mod:`~formkit.tables.small_forms` — composition and prime forms on plain integers for
  ``|D| < 2^60`` (the inner loops of the structure);
* :mod:`~formkit.tables.statistics` — p-ranks and the other counts users tabulate,
  beside the Cohen–Lenstra and Gerth predictions.

Every row is unconditional: class numbers by complete enumeration of reduced forms or by
the theta series, structures forced by ``h`` or built from explicit relations.  This layer imports
:mod:`formkit.core`, :mod:`formkit.classgroups`, :mod:`formkit.errors` and
``formkit._version`` (recorded in each store); the names below are re-exported by
:mod:`formkit`.
"""

from .display import *  # noqa: F403
from .display import __all__ as _display_all
from .hurwitz_relation import *  # noqa: F403
from .hurwitz_relation import __all__ as _relation_all
from .parallel import *  # noqa: F403
from .parallel import __all__ as _parallel_all
from .rows import *  # noqa: F403
from .rows import __all__ as _rows_all
from .statistics import *  # noqa: F403
from .statistics import __all__ as _statistics_all
from .store import *  # noqa: F403
from .store import __all__ as _store_all
from .structure import *  # noqa: F403
from .structure import __all__ as _structure_all
from .theta import *  # noqa: F403
from .theta import __all__ as _theta_all

__all__ = [
    *_display_all,
    *_rows_all,
    *_parallel_all,
    *_store_all,
    *_theta_all,
    *_relation_all,
    *_structure_all,
    *_statistics_all,
]
