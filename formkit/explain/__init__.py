"""The explain layer: worked examples, step by step, as Markdown or LaTeX.

For papers, theses and lectures: each ``worked_*`` function runs a computation while
recording every intermediate number, and writes it out as Markdown or as LaTeX (a
complete document, or a fragment to paste into one).

* :mod:`~formkit.explain.document` — the record (:class:`WorkedExample`, a sequence of
  blocks) and its Markdown and LaTeX writers;
* :mod:`~formkit.explain.reduction` — every reduction step with its matrix;
* :mod:`~formkit.explain.composition` — Dirichlet composition with every intermediate value;
* :mod:`~formkit.explain.representation` — the square-root method behind each solution
  of Q(x, y) = n;
* :mod:`~formkit.explain.handout` — one complete handout on a discriminant;
* :mod:`~formkit.explain.orders` — class number formula and kernel for orders;
* :mod:`~formkit.explain.class_group` — the class table with orders, discrete logarithms
  and genus characters.

Each ``worked_*`` function returns a :class:`WorkedExample`; ``.render("md")`` /
``.render("tex")`` give the text and ``.to_dict()`` the recorded numbers;
``explain_reduction(form, format="md")`` and its siblings return the text directly (the
command ``formkit explain``).  This layer imports :mod:`formkit.core`,
:mod:`formkit.classgroups` and :mod:`formkit.errors`; the names below are re-exported by
:mod:`formkit`.
"""

from .class_group import *  # noqa: F403
from .class_group import __all__ as _class_group_all
from .composition import *  # noqa: F403
from .composition import __all__ as _composition_all
from .document import EXPLAIN_FORMATS, WorkedExample
from .handout import *  # noqa: F403
from .handout import __all__ as _handout_all
from .reduction import *  # noqa: F403
from .reduction import __all__ as _reduction_all
from .representation import *  # noqa: F403
from .representation import __all__ as _representation_all

__all__ = [
    "WorkedExample",
    "EXPLAIN_FORMATS",
    *_reduction_all,
    *_composition_all,
    *_representation_all,
    *_class_group_all,
    *_handout_all,
]
