"""Draw the pictures of the documentation gallery with formkit itself (called by conf.py).

Each picture is small (a few seconds in all) and redrawn only when missing, so that a
documentation build stays within a minute.  ``python docs/make_gallery.py`` redraws them all.
"""

from __future__ import annotations

import pathlib
import sys


def _pictures():
    import formkit
    from formkit.graphs.plotting import save_picture
    from formkit.graphs.series_pictures import critical_line_picture, genus_average_picture

    # (file name, function drawing it into the path)
    return [
        ("cayley_-4004.png", lambda p: save_picture(formkit.cayley_graph(-4004), p)),
        ("cayley_-199_primes_2_5.png", lambda p: save_picture(formkit.cayley_graph(-199, [2, 5]), p)),
        ("cycle_1001.png", lambda p: save_picture(formkit.cycle_graph(1001), p)),
        ("fibre_-252.png", lambda p: save_picture(formkit.fibre_graph(-252), p)),
        (
            "critical_line_-23.png",
            lambda p: critical_line_picture(formkit.critical_line_samples(-23, 30, points=200, digits=8), p),
        ),
        (
            "genus_average_1_1_6.png",
            lambda p: genus_average_picture(formkit.theta_decomposition((1, 1, 6), 60), p),
        ),
    ]


def make_pictures(out: pathlib.Path, *, force: bool = False) -> list[pathlib.Path]:
    """Draw the gallery pictures into ``out`` (only the missing ones unless ``force``)."""
    out.mkdir(parents=True, exist_ok=True)
    written = []
    for name, draw in _pictures():
        path = out / name
        if force or not path.exists():
            draw(str(path))
        written.append(path)
    return written


if __name__ == "__main__":
    for path in make_pictures(pathlib.Path(__file__).resolve().parent / "_generated", force=True):
        sys.stdout.write(f"{path}\n")
