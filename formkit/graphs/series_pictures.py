"""Pictures of the analytic side: |L(½ + it, χ_D)| on the critical line, r_Q(n) against its genus average.

matplotlib is optional (``pip install 'formkit[plot]'``) and imported only here, when a
picture is drawn (the object-oriented ``Figure`` API, no pyplot state).  The numbers
drawn come from :func:`formkit.analytic.l_series.critical_line_samples` and
:func:`formkit.classgroups.genus_theta.theta_decomposition`; the picture names how they
were obtained in its caption.

References
----------
.. [1] J. D. Hunter, "Matplotlib: a 2D graphics environment", Comput. Sci. Eng. 9 (2007).
"""

from __future__ import annotations

import os

from ..analytic.l_series import CriticalLineSamples
from ..classgroups.genus_theta import ThetaDecomposition
from ..errors import FormkitError
from .plotting import PICTURE_FORMATS

__all__ = ["critical_line_picture", "genus_average_picture"]


def _figure():
    try:
        from matplotlib.figure import Figure
    except ImportError as exc:
        raise FormkitError(
            "pictures need matplotlib, which is not installed: pip install 'formkit[plot]'"
        ) from exc
    return Figure(figsize=(8, 4.5), dpi=110)


def _format(path: str | os.PathLike[str]) -> str:
    fmt = os.path.splitext(str(path))[1].lstrip(".").lower()
    if fmt not in PICTURE_FORMATS:
        raise FormkitError(f"pictures are written as .png or .svg; cannot tell the format of {str(path)!r}")
    return fmt


def critical_line_picture(samples: CriticalLineSamples, path: str | os.PathLike[str]) -> str:
    """Draw ``|L(½ + it, χ_D)|`` against ``t`` and save it as PNG or SVG; returns the format.

    Raises
    ------
    FormkitError
        If matplotlib is missing or the suffix is not ``.png``/``.svg``.
    """
    fmt = _format(path)
    fig = _figure()
    ax = fig.add_subplot(1, 1, 1)
    ax.plot(samples.heights, samples.values, color="#1f5fa8", lw=1.2)
    ax.axhline(0, color="0.6", lw=0.6)
    name = "ζ(½ + it)" if samples.discriminant == 1 else f"L(½ + it, χ_{samples.discriminant})"
    ax.set_xlabel("t")
    ax.set_ylabel(f"|{name}|")
    ax.set_title(f"|{name}| on the critical line, {len(samples.values)} points")
    ax.set_xlim(samples.heights[0], samples.heights[-1])
    ax.set_ylim(bottom=0)
    fig.text(
        0.01,
        0.01,
        f"each value certified to {samples.digits} digits (ball arithmetic); formkit.critical_line_samples",
        fontsize=7,
        color="0.35",
    )
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    fig.savefig(path, format=fmt)
    return fmt


def genus_average_picture(decomposition: ThetaDecomposition, path: str | os.PathLike[str]) -> str:
    """Draw ``r_Q(n)``, Siegel's genus average and the cusp part against ``n``; returns the format.

    Raises
    ------
    FormkitError
        If matplotlib is missing or the suffix is not ``.png``/``.svg``.
    """
    fmt = _format(path)
    t = decomposition
    n = list(range(t.bound + 1))
    r = [t.theta[k] for k in n]
    avg = [float(t.genus_average(k)) for k in n]
    cusp = [float(t.cusp_coefficient(k)) for k in n]
    fig = _figure()
    ax = fig.add_subplot(1, 1, 1)
    ax.vlines(n, 0, r, color="#1f5fa8", lw=1.6, label="r_Q(n)")
    ax.plot(n, avg, "o", ms=3.2, color="#d0691a", label="genus average (Siegel; = Eisenstein series)")
    ax.plot(n, cusp, "_", ms=7, mew=1.6, color="#2a9d4b", label="cusp part r_Q(n) − average")
    ax.axhline(0, color="0.6", lw=0.6)
    ax.set_xlabel("n")
    ax.set_ylabel("count")
    Q = t.form.to_list()
    ax.set_title(
        f"Q = {Q} (D = {t.form.discriminant}): genus of {len(t.genus_forms)} class"
        f"{'es' if len(t.genus_forms) != 1 else ''}"
    )
    ax.legend(fontsize=8, loc="upper left")
    source = "genus-character" if "genus characters" in t.eisenstein_method else "local-density (Siegel)"
    check = {True: f"average = {source} Eisenstein series", False: "AVERAGE ≠ EISENSTEIN", None: ""}[
        t.siegel_agrees
    ]
    fig.text(
        0.01,
        0.01,
        f"exact counts; {t.provenance}; {check}; formkit.theta_decomposition",
        fontsize=7,
        color="0.35",
    )
    fig.tight_layout(rect=(0, 0.03, 1, 1))
    fig.savefig(path, format=fmt)
    return fmt
