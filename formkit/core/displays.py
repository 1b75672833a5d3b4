"""Notebook displays for the small result types: one readable sentence and its provenance.

A result type that mixes in :class:`SentenceDisplay` and defines ``_display_sentence()``
(and, when the result is not an exact unconditional computation, ``_display_provenance()``)
gets ``_repr_html_`` (the sentence, the provenance underneath in small type, a GRH mark in
bold when the result is conditional) and ``_repr_latex_`` (the same as LaTeX text), the
hooks IPython and Jupyter call.  The larger types (forms, class groups, ideals, tables,
graphs) write their own displays.

References
----------
IPython's rich display protocol (``_repr_html_``, ``_repr_latex_``), common practice.
"""

from __future__ import annotations

import html

__all__ = ["SentenceDisplay", "latex_text"]


def latex_text(text: str) -> str:
    r"""Plain text as LaTeX ``$\text{…}$``, the characters LaTeX reserves escaped.

    Examples
    --------
    >>> latex_text("h_K = 1 & 50%")
    '$\\text{h\\_K = 1 \\& 50\\%}$'
    """
    out = []
    for ch in text:
        if ch in "_%&#${}":
            out.append("\\" + ch)
        elif ch == "\\":
            out.append(r"\textbackslash{}")
        elif ch in "^~":
            out.append(r"\textasciicircum{}" if ch == "^" else r"\textasciitilde{}")
        else:
            out.append(ch)
    return r"$\text{" + "".join(out) + "}$"


class SentenceDisplay:
    """Mixin: ``_repr_html_`` and ``_repr_latex_`` from ``_display_sentence()``.

    Examples
    --------
    >>> class Half(SentenceDisplay):
    ...     def _display_sentence(self):
    ...         return "1/2 < 1"
    >>> Half()._repr_html_()
    '<p>1/2 &lt; 1<br><small>exact computation, unconditional</small></p>'
    """

    __slots__ = ()

    def _display_sentence(self) -> str:
        return repr(self)

    def _display_provenance(self) -> str:
        return "exact computation, unconditional"

    def _display_conditional(self) -> bool:
        return "GRH" in self._display_provenance()

    def _repr_html_(self) -> str:
        mark = "<b>conditional on GRH</b>: " if self._display_conditional() else ""
        return (
            f"<p>{html.escape(self._display_sentence())}<br>"
            f"<small>{mark}{html.escape(self._display_provenance())}</small></p>"
        )

    def _repr_latex_(self) -> str:
        mark = "[GRH] " if self._display_conditional() else ""
        return latex_text(f"{mark}{self._display_sentence()} ({self._display_provenance()})")
