"""The table layer: class numbers and class groups over ranges of discriminants.

* :mod:`~formkit.tables.rows` — table rows, chunks of a range, :func:`table_rows` and
  :func:`class_numbers`;
* :mod:`~formkit.tables.sweep` — the sweeps that count reduced forms for a whole chunk of
  negative discriminants at once (numpy and pure Python);
* :mod:`~formkit.tables.store` — the resumable SQLite file, and reading it back;
* :mod:`~formkit.tables.parallel` — building a store on all cores or a Dask cluster.

Every row comes from complete enumeration and is unconditional.  This layer imports
:mod:`formkit.core`, :mod:`formkit.classgroups`, :mod:`formkit.errors` and
``formkit._version`` (recorded in each store); the names below are re-exported by
:mod:`formkit`.
"""

from .parallel import *  # noqa: F403
from .parallel import __all__ as _parallel_all
from .rows import *  # noqa: F403
from .rows import __all__ as _rows_all
from .store import *  # noqa: F403
from .store import __all__ as _store_all

__all__ = [*_rows_all, *_parallel_all, *_store_all]
