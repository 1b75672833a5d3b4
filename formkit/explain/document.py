"""A small document model for worked examples, written out as Markdown or LaTeX.

:mod:`formkit.explain` describes each worked example as a sequence of blocks
(headings, paragraphs, numbered lists, tables, displayed formulas).  Inline pieces are
either plain text (ASCII) or :class:`Math`, which carries two spellings of the same
formula: LaTeX for ``.tex`` output and plain text (Unicode allowed) for Markdown, where
it is set in code spans so that it reads well in a terminal and renders everywhere.

The LaTeX writer escapes the characters that are special to TeX in text (``\\ { } $ &
# ^ _ % ~``), sets signed integers and lone letters of running text in math mode (so no
hyphen stands for a minus sign and no variable is upright), produces pure ASCII, and
uses only ``geometry``, ``amsmath``, ``array`` and ``longtable`` (all in
texlive-latex-base / -recommended).  Tables too wide for the text width get paragraph
columns; long tables break across pages with their header repeated.  A complete document
(``article`` class, with a line stating the notation) is written unless a fragment is
asked for; headings start at a chosen sectioning level.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass, field

from ..core.arith import as_int
from ..errors import FormkitError

__all__ = [
    "EXPLAIN_FORMATS",
    "Math",
    "Heading",
    "Paragraph",
    "Items",
    "Table",
    "Display",
    "WorkedExample",
    "formula",
    "text",
    "render_markdown",
    "render_latex",
    "escape_tex",
    "SECTIONING",
    "NOTATION",
]

#: Output formats of the worked examples.
EXPLAIN_FORMATS = ("md", "tex")


def _check_count(value: object, name: str, least: int) -> int:
    v = as_int(value, name)
    if v < least:
        raise FormkitError(f"{name} must be at least {least}, not {v}")
    return v


@dataclass(frozen=True)
class Math:
    """A formula: ``tex`` (LaTeX math mode, no dollars) and ``plain`` (for Markdown)."""

    tex: str
    plain: str


Inline = str | Math
Line = tuple[Inline, ...]


@dataclass(frozen=True)
class Heading:
    """A heading; ``level`` 1 (the title), 2 (section) or 3 (subsection)."""

    level: int
    text: str


@dataclass(frozen=True)
class Paragraph:
    """A paragraph of text and formulas."""

    parts: Line


@dataclass(frozen=True)
class Items:
    """A numbered (``numbered=True``) or bulleted list; each item is a line."""

    items: tuple[Line, ...]
    numbered: bool = True


@dataclass(frozen=True)
class Table:
    """A table: header cells and rows of cells (each cell a line)."""

    header: tuple[Line, ...]
    rows: tuple[tuple[Line, ...], ...]


@dataclass(frozen=True)
class Display:
    """A displayed formula."""

    math: Math


Block = Heading | Paragraph | Items | Table | Display


def line(*parts: Inline) -> Line:
    """A tuple of inline parts (helper for the builders)."""
    return tuple(parts)


# ---------------------------------------------------------------------------
# a small markup: formulas written once, spelled for TeX and for plain text

_MATRIX = re.compile(r"\[\[([^\[\]]*), ([^\[\]]*)\], \[([^\[\]]*), ([^\[\]]*)\]\]")

_TEX_RULES = (
    (_MATRIX, lambda m: r"\begin{{pmatrix}} {} & {} \\ {} & {} \end{{pmatrix}}".format(*m.groups())),
    (re.compile(r"floor\(sqrt\(D\)\)"), r"\\lfloor\\sqrt{D}\\rfloor"),
    (re.compile(r"sqrt\(([^()]*)\)"), r"\\sqrt{\1}"),
    (re.compile(r"<="), r"\\le "),
    (re.compile(r">="), r"\\ge "),
    (re.compile(r"!="), r"\\ne "),
    (re.compile(r"->"), r"\\to "),
    (re.compile(r"\(mod ([^()]*)\)"), r"\\pmod{\1}"),
    (re.compile(r"\bmod\b"), r"\\bmod "),
    (re.compile(r"\bgcd\b"), r"\\gcd"),
    (re.compile(r"\brho\b"), r"\\rho"),
    (re.compile(r"\btau"), r"\\tau"),
    (re.compile(r"\bomega\b"), r"\\omega"),
    (re.compile(r"\balpha\b"), r"\\alpha"),
    (re.compile(r"\bbeta\b"), r"\\beta"),
    (re.compile(r"∏"), r"\\prod "),
    (re.compile(r"\bchi_D\b"), r"\\chi_D"),
    (re.compile(r"\bdelta\b"), r"\\delta"),
    (re.compile(r"\bmu\b"), r"\\mu"),
    (re.compile(r"\bepsilon\b"), r"\\varepsilon"),
    (re.compile(r"\bCl\b"), r"\\mathrm{Cl}"),
    (re.compile(r"\bO_K\b"), r"\\mathcal{O}_K"),
    (re.compile(r"(?<![{\\\w])O(?![\w}])"), r"\\mathcal{O}"),
    (re.compile(r"⁻¹"), r"^{-1}"),
    (re.compile(r"−"), r"-"),
    (re.compile(r"·"), r"\\cdot "),
    (re.compile(r"≡"), r"\\equiv "),
    (re.compile(r"≅"), r"\\cong "),
    (re.compile(r"×"), r"\\times "),
    (re.compile(r" \* "), r" \\ast "),
    (re.compile(r"\b([abcdvxyuntr])([0-9])\b"), r"\1_{\2}"),
    (re.compile(r"\bC([0-9]+)\b"), r"C_{\1}"),
)

_PLAIN_RULES = (
    (re.compile(r"floor\(sqrt\(D\)\)"), "⌊√D⌋"),
    (re.compile(r"sqrt\(([A-Za-z0-9]+)\)"), r"√\1"),
    (re.compile(r"<="), "≤"),
    (re.compile(r">="), "≥"),
    (re.compile(r"!="), "≠"),
    (re.compile(r"->"), "→"),
    (re.compile(r"\brho\b"), "ρ"),
    (re.compile(r"\btau"), "τ"),
    (re.compile(r"\bomega\b"), "ω"),
    (re.compile(r"\balpha\b"), "α"),
    (re.compile(r"\bbeta\b"), "β"),
    (re.compile(r"sqrt\((-?[A-Za-z0-9]+)\)"), r"√\1"),
    (re.compile(r"\bchi_D\b"), "χ_D"),
    (re.compile(r"\bdelta\b"), "δ"),
    (re.compile(r"\bmu\b"), "μ"),
    (re.compile(r"\bepsilon\b"), "ε"),
    (re.compile(r"\^2\b"), "²"),
    (re.compile(r"\^\{([^{}]*)\}"), r"^(\1)"),
    (re.compile(r"\\"), ""),
)


def formula(src: str) -> Math:
    """A formula from a one-line source spelling, e.g. ``"b^2 - 4ac <= sqrt(D)"``.

    The source uses ``^2``, ``^{…}``, ``sqrt(…)``, ``floor(sqrt(D))``, ``<=``, ``>=``,
    ``!=``, ``->``, ``mod``, ``gcd``, ``rho``, ``chi_D``, ``delta``, ``epsilon``,
    ``·``, ``≡`` and digits after a letter as subscripts (``a1``).

    Examples
    --------
    >>> f = formula("b^2 - 4a1c <= sqrt(D)")
    >>> f.plain
    'b² - 4a1c ≤ √D'
    >>> formula("v1 = a1/d1").tex
    'v_{1} = a_{1}/d_{1}'
    """
    tex, plain = src, src
    for pat, rep in _TEX_RULES:
        tex = pat.sub(rep, tex)
    for pat, rep in _PLAIN_RULES:
        plain = pat.sub(rep, plain)
    return Math(tex, plain)


def text(src: str) -> Line:
    """Text with formulas between ``@`` signs: ``text("so @d1 = 1@ here")``.

    Examples
    --------
    >>> [type(p).__name__ for p in text("so @d1 = 1@ here")]
    ['str', 'Math', 'str']
    """
    parts = src.split("@")
    if len(parts) % 2 == 0:  # pragma: no cover - programming error in a builder
        raise ValueError(f"unbalanced @ in {src!r}")
    return tuple(formula(p) if i % 2 else p for i, p in enumerate(parts) if p)


def para(src: str) -> Paragraph:
    """A paragraph from :func:`text` markup."""
    return Paragraph(text(src))


# ---------------------------------------------------------------------------
# the result type


@dataclass(frozen=True)
class WorkedExample:
    """A worked example: the recorded numbers and the document describing them.

    Attributes
    ----------
    kind : str
        ``"reduce"``, ``"compose"``, ``"represent"`` or ``"group"``.
    title : str
    data : dict
        Every recorded number, JSON-ready (the ``data`` of ``formkit explain --json``).
    blocks : tuple
        The document.
    """

    kind: str
    title: str
    data: dict = field(repr=False)
    blocks: tuple[Block, ...] = field(repr=False)

    def render(
        self,
        format: str = "md",
        *,
        fragment: bool = False,
        sectioning: str = "section",
        numbered: bool = False,
    ) -> str:
        """The example as ``"md"`` (Markdown) or ``"tex"`` (LaTeX; ``fragment=True``
        leaves out the preamble and the ``document`` environment; ``sectioning`` and
        ``numbered`` as in :func:`render_latex`).

        Raises
        ------
        FormkitError
            For an unknown format.
        """
        if format == "md":
            return render_markdown(self.blocks)
        if format == "tex":
            return render_latex(
                self.blocks, title=self.title, fragment=fragment, sectioning=sectioning, numbered=numbered
            )
        raise FormkitError(f"format must be 'md' or 'tex', not {format!r}")

    def to_dict(self) -> dict:
        """``{"kind", "title", "data"}``."""
        return {"kind": self.kind, "title": self.title, "data": self.data}

    def _repr_markdown_(self) -> str:
        return self.render("md")


# ---------------------------------------------------------------------------
# Markdown


def _merged(parts: Sequence[Inline]) -> list:
    """Adjacent formulas joined into one (so no two formulas touch: ``$a$$b$`` would
    open display math in TeX and ````a````b```` a double code span in Markdown)."""
    if isinstance(parts, (str, Math)):  # a single part given as a cell
        parts = (parts,)
    out: list = []
    for p in parts:
        if isinstance(p, Math) and out and isinstance(out[-1], Math):
            out[-1] = Math(out[-1].tex + " " + p.tex, out[-1].plain + p.plain)
        elif p != "":
            out.append(p)
    return out


def _md_inline(parts: Sequence[Inline], in_table: bool = False) -> str:
    out = []
    for p in _merged(parts):
        if isinstance(p, Math):
            out.append(f"`{p.plain}`")
        else:
            out.append(p)
    text = "".join(out)
    if in_table:
        text = text.replace("|", "\\|")
    return text


def render_markdown(blocks: Sequence[Block]) -> str:
    """The blocks as Markdown text (ends with a newline)."""
    out: list[str] = []
    for b in blocks:
        if isinstance(b, Heading):
            out.append("#" * b.level + " " + b.text)
        elif isinstance(b, Paragraph):
            out.append(_md_inline(b.parts))
        elif isinstance(b, Items):
            out.append(
                "\n".join(
                    (f"{i}. " if b.numbered else "- ") + _md_inline(item) for i, item in enumerate(b.items, 1)
                )
            )
        elif isinstance(b, Table):
            rows = ["| " + " | ".join(_md_inline(c, True) for c in b.header) + " |"]
            rows.append("|" + "|".join("---" for _ in b.header) + "|")
            rows.extend("| " + " | ".join(_md_inline(c, True) for c in r) + " |" for r in b.rows)
            out.append("\n".join(rows))
        elif isinstance(b, Display):
            out.append("    " + b.math.plain)
        else:  # pragma: no cover - programming error
            raise TypeError(f"unknown block {b!r}")
    return "\n\n".join(out) + "\n"


# ---------------------------------------------------------------------------
# LaTeX

_TEX_SPECIAL = {
    "\\": r"\textbackslash{}",
    "{": r"\{",
    "}": r"\}",
    "$": r"\$",
    "&": r"\&",
    "#": r"\#",
    "^": r"\^{}",
    "_": r"\_",
    "%": r"\%",
    "~": r"\textasciitilde{}",
    "<": r"\textless{}",
    ">": r"\textgreater{}",
    "|": r"\textbar{}",
}

# the few non-ASCII characters the builders' text may contain, and their TeX
_TEX_UNICODE = {
    "—": "---",
    "–": "--",
    "’": "'",
    "≤": r"$\le$",
    "≥": r"$\ge$",
    "·": r"$\cdot$",
    "×": r"$\times$",
    "−": r"$-$",
    "≡": r"$\equiv$",
    "√": r"$\sqrt{\phantom{x}}$",
    "²": r"$^2$",
    "…": r"\dots{}",
}


def escape_tex(text: str) -> str:
    """Text with TeX's special characters escaped, in ASCII.

    Raises
    ------
    ValueError
        If the text contains a non-ASCII character without a TeX spelling here
        (a programming error in a builder, never user input).

    Examples
    --------
    >>> escape_tex("50% of a_1 & b #2")
    '50\\\\% of a\\\\_1 \\\\& b \\\\#2'
    """
    out = []
    for ch in text:
        if ch in _TEX_SPECIAL:
            out.append(_TEX_SPECIAL[ch])
        elif ord(ch) < 128:
            out.append(ch)
        elif ch in _TEX_UNICODE:
            out.append(_TEX_UNICODE[ch])
        else:
            raise ValueError(f"no TeX spelling for the character {ch!r} in {text!r}")
    return "".join(out)


# In running text: a signed integer, a lone letter other than the words "a", "A", "I"
# (a variable: "the value m", "for each b"), and the Greek names, are set in math mode,
# so that no hyphen stands for a minus sign and no variable is set upright.
_AUTO_MATH = re.compile(
    r"(?<![\w.'’\-])([-−]\d+)(?![\w])"  # a negative integer
    r"|(?<![\w.'’\\])([b-zB-HJ-Z])(?![\w'’]|\.\w)"  # a lone letter (not "e.g.", "i.e.")
    r"|\b(rho|mu|delta|epsilon|chi)\b"
)
_GREEK = {"rho": r"\rho", "mu": r"\mu", "delta": r"\delta", "epsilon": r"\varepsilon", "chi": r"\chi"}


def _text_to_tex(text: str) -> str:
    out = []
    pos = 0
    for m in _AUTO_MATH.finditer(text):
        out.append(escape_tex(text[pos : m.start()]))
        number, letter, greek = m.groups()
        if number:
            out.append("$-" + number[1:] + "$")
        elif letter:
            out.append(f"${letter}$")
        else:
            out.append(f"${_GREEK[greek]}$")
        pos = m.end()
    out.append(escape_tex(text[pos:]))
    return "".join(out)


def _tex_inline(parts: Sequence[Inline]) -> str:
    out = []
    for p in _merged(parts):
        if isinstance(p, Math):
            out.append(f"${p.tex}$")
        else:
            out.append(_text_to_tex(p))
    return "".join(out)


#: Sectioning commands, from the top; a heading of level k is set ``k − 1`` below the
#: level asked for (``sectioning="section"``: title → \section, level 2 → \subsection).
SECTIONING = ("part", "chapter", "section", "subsection", "subsubsection", "paragraph")

#: The notation stated at the head of every complete document.
NOTATION = (
    r"Notation. A triple $(a, b, c)$ is the binary quadratic form $ax^2 + bxy + cy^2$, of discriminant "
    r"$D = b^2 - 4ac$; forms and classes are written as triples throughout. $C_n$ is the cyclic group of "
    r"order $n$, class groups are written as products $C_{n_1} \times C_{n_2} \times \cdots$ with "
    r"$n_1 \mid n_2 \mid \cdots$, and $C_1$ is the trivial group."
)

_TEXT_WIDTH_PT = 450.0  # a4paper with 2.5 cm margins (the complete documents' geometry)
_CHAR_PT = 6.0  # a generous average width of a character at 11 pt (digits are 5.5 pt)
_COL_SEP_PT = 12.0  # 2 \tabcolsep


def _cell_width(cell) -> float:
    parts = _merged(cell)
    n = 0.0
    for p in parts:
        n += len(p.plain) * 1.1 if isinstance(p, Math) else len(p)
    return n * _CHAR_PT


def _column_spec(table: Table) -> str:
    """``l`` columns when the table fits the text width, else the widest columns become
    ragged-right paragraph columns sharing what is left of the width."""
    ncol = len(table.header)
    nat = [
        max([_cell_width(table.header[i])] + [_cell_width(r[i]) for r in table.rows if i < len(r)])
        for i in range(ncol)
    ]
    if sum(nat) + _COL_SEP_PT * ncol <= _TEXT_WIDTH_PT:
        return "l" * ncol
    # narrow columns keep their width; the others share the rest in proportion
    avail = _TEXT_WIDTH_PT - _COL_SEP_PT * ncol
    fair = avail / ncol
    narrow = {i for i in range(ncol) if nat[i] <= fair}
    rest = avail - sum(nat[i] for i in narrow)
    wide = sum(nat[i] for i in range(ncol) if i not in narrow)
    spec = []
    for i in range(ncol):
        if i in narrow:
            spec.append("l")
        else:
            frac = max(0.05, rest * nat[i] / wide / _TEXT_WIDTH_PT * 0.97)
            spec.append(rf">{{\raggedright\arraybackslash}}p{{{frac:.3f}\linewidth}}")
    return "".join(spec)


def _after_title(text: str, note: str) -> str:
    """``note`` as a paragraph after the first heading (or at the start)."""
    first, sep, rest = text.partition("\n\n")
    if first.startswith("\\") and "{" in first and sep:
        return first + "\n\n" + note + "\n\n" + rest
    return note + "\n\n" + text


def render_latex(
    blocks: Sequence[Block],
    *,
    title: str = "",
    fragment: bool = False,
    sectioning: str = "section",
    numbered: bool = False,
) -> str:
    r"""The blocks as LaTeX: a complete ``article`` document, or the body alone.

    Parameters
    ----------
    blocks : sequence of blocks
    title : str
        Written as a comment at the head of a complete document.
    fragment : bool
        Leave out the preamble and the ``document`` environment (to ``\input`` the
        text into a larger document, which must load ``amsmath``, ``array`` and
        ``longtable``).
    sectioning : str
        The sectioning command of the title heading, one of :data:`SECTIONING`
        (default ``"section"``); lower headings go one step down each.
    numbered : bool
        Numbered headings (``\section``) instead of unnumbered (``\section*``).

    Raises
    ------
    FormkitError
        For an unknown sectioning level.

    Examples
    --------
    >>> print(render_latex([Heading(1, "Forms of discriminant -23")], fragment=True, sectioning="subsection"))
    \subsection*{Forms of discriminant $-23$}
    <BLANKLINE>
    """
    if sectioning not in SECTIONING:
        raise FormkitError(f"sectioning must be one of {', '.join(SECTIONING)}, not {sectioning!r}")
    top = SECTIONING.index(sectioning)
    star = "" if numbered else "*"
    body: list[str] = []
    for b in blocks:
        if isinstance(b, Heading):
            cmd = SECTIONING[min(top + b.level - 1, len(SECTIONING) - 1)]
            body.append(f"\\{cmd}{star}{{{_text_to_tex(b.text)}}}")
        elif isinstance(b, Paragraph):
            body.append(_tex_inline(b.parts))
        elif isinstance(b, Items):
            env = "enumerate" if b.numbered else "itemize"
            items = "\n".join(r"  \item " + _tex_inline(item) for item in b.items)
            body.append(f"\\begin{{{env}}}\n{items}\n\\end{{{env}}}")
        elif isinstance(b, Table):
            cols = _column_spec(b)
            head = " & ".join(_tex_inline(c) for c in b.header) + r" \\"
            rows = "\n".join(" & ".join(_tex_inline(c) for c in r) + r" \\" for r in b.rows)
            body.append(
                f"\\begin{{longtable}}{{{cols}}}\n\\hline\n{head}\n\\hline\n\\endhead\n"
                f"\\hline\n\\endfoot\n{rows}\n\\end{{longtable}}"
            )
        elif isinstance(b, Display):
            body.append("\\[\n" + b.math.tex + "\n\\]")
        else:  # pragma: no cover - programming error
            raise TypeError(f"unknown block {b!r}")
    text = "\n\n".join(body) + "\n"
    bad = sorted({ch for ch in text if ord(ch) > 127})
    if bad:  # pragma: no cover - a builder passed a formula without a TeX spelling
        raise ValueError(f"non-ASCII characters {bad!r} would reach the LaTeX document")
    if fragment:
        return text
    cls = "report" if top <= 1 else "article"
    return (
        f"\\documentclass[11pt,a4paper]{{{cls}}}\n"
        "\\usepackage[margin=2.5cm]{geometry}\n"
        "\\usepackage{amsmath}\n"
        "\\usepackage{array}\n"
        "\\usepackage{longtable}\n"
        "\\setlength{\\parindent}{0pt}\n"
        "\\setlength{\\parskip}{0.6ex}\n"
        "\\setlength{\\emergencystretch}{3em}\n"
        "\\allowdisplaybreaks\n"
        f"% {escape_tex(title)} -- written by formkit\n"
        "\\begin{document}\n\n" + _after_title(text, NOTATION) + "\n\\end{document}\n"
    )


# ---------------------------------------------------------------------------
# pieces shared by the builders: forms, matrices, reduction steps


def m_int(x: object) -> Math:
    """An integer (or any short value) as a formula."""
    s = str(x)
    return Math(s, s)


def m_form(f) -> Math:
    """A form as the triple ``(a, b, c)``."""
    s = f"({f.a}, {f.b}, {f.c})"
    return Math(s, s)


def m_poly(f) -> Math:
    """A form as the polynomial ``ax² + bxy + cy²``."""
    return Math(f._repr_latex_().strip("$"), str(f))


def m_matrix(M) -> Math:
    """A 2×2 matrix ``((p, q), (r, s))``."""
    (p, q), (r, s) = M
    return Math(rf"\begin{{pmatrix}} {p} & {q} \\ {r} & {s} \end{{pmatrix}}", f"[[{p}, {q}], [{r}, {s}]]")


def m_vector(v) -> Math:
    """A pair ``(x, y)``."""
    s = f"({v[0]}, {v[1]})"
    return Math(s, s)


def matrix_list(M) -> list:
    """A matrix as nested lists (JSON)."""
    return [list(M[0]), list(M[1])]


def _step_line(step, running) -> Line:
    b, a = step.before, step.after
    if step.kind == "translate":
        how = text(f"translate by @k = {step.matrix[0][1]}@: @b + 2ak = {a.b}@, @ak^2 + bk + c = {a.c}@")
    elif step.kind == "swap":
        why = "@|a| > |c|@" if abs(b.a) != abs(b.c) else "@a = c@ and b has the wrong sign"
        how = text(f"swap @(a, b, c) -> (c, -b, a)@ since {why}")
    else:
        how = text(f"rho with @t = {step.matrix[1][1]}@: @b' = -b + 2ct = {a.b}@, @(b'^2 - D)/4c = {a.c}@")
    return (
        (m_form(b), " to ", m_form(a), " by ", m_matrix(step.matrix), ": ")
        + how
        + (
            "; running product ",
            m_matrix(running),
        )
    )


def why_reduced(f) -> Line:
    """Why the form ``f`` is reduced, with its numbers."""
    from ..core.arith import isqrt

    D = f.discriminant
    if D < 0:
        a, b, c = (f.a, f.b, f.c) if f.a > 0 else (-f.a, -f.b, -f.c)
        pre = "" if f.a > 0 else "its negative "
        extra = ""
        if abs(b) == a or a == c:
            extra = f", and @b = {b} >= 0@ as @|b| = a@ or @a = c@"
        return text(
            f"The form is reduced: for {pre}@({a}, {b}, {c})@, @|b| = {abs(b)} <= a = {a} <= c = {c}@{extra}."
        )
    s = int(isqrt(D))
    return text(
        f"The form is reduced: with @s = floor(sqrt(D)) = {s}@ we have @0 < b = {f.b} <= s@ and "
        f"@s - b = {s - f.b} < 2|a| = {2 * abs(f.a)} <= s + b = {s + f.b}@, that is "
        "@0 < b < sqrt(D)@ and @sqrt(D) - b < 2|a| < sqrt(D) + b@."
    )


def reduction_blocks(res) -> tuple[list, list]:
    """The steps of a :class:`~formkit.core.reduction.ReductionResult` (recorded with
    ``steps=True``) as blocks, and as JSON records with the running matrix."""
    blocks: list = []
    running = ((1, 0), (0, 1))
    items = []
    recs = []
    for st in res.steps:
        (p, q), (r, s) = running
        (e, f), (g, h) = st.matrix
        running = ((p * e + q * g, p * f + q * h), (r * e + s * g, r * f + s * h))
        items.append(_step_line(st, running))
        recs.append(
            {
                "kind": st.kind,
                "before": st.before.to_list(),
                "matrix": matrix_list(st.matrix),
                "after": st.after.to_list(),
                "running_matrix": matrix_list(running),
            }
        )
    if items:
        blocks.append(Items(tuple(items)))
    else:
        blocks.append(Paragraph((m_form(res.form), " is already reduced; no step is needed.")))
    if res.form.transform(res.matrix) != res.reduced:  # pragma: no cover - would be a bug in reduction
        raise ArithmeticError(f"reduction of {res.form!r}: the matrix does not give the reduced form")
    blocks.append(
        Paragraph(
            (
                "Result: ",
                m_form(res.form),
                " transformed by ",
                m_matrix(res.matrix),
                " is ",
                m_form(res.reduced),
                " (checked by substituting the matrix into the form).",
            )
        )
    )
    blocks.append(Paragraph(why_reduced(res.reduced)))
    return blocks, recs
