"""An SQLite file of relations among prime forms, written as they are found, so that a run resumes.

A store belongs to one discriminant and one factor-base bound (both kept in its ``meta``
table; opening it for another ``D`` or bound is an error).  Relations are rows of
``relations``; the indices of the finished sieve tasks are rows of ``tasks``.  Each
finished task is one transaction: a killed run loses at most the tasks that were still
running, and the same call with the same store continues where it stopped.

The layout is formkit's own (plain SQLite, readable with any SQLite client):
``meta(key TEXT PRIMARY KEY, value TEXT)``, ``relations(exponents TEXT, large INTEGER,
sign INTEGER, beta TEXT)`` with ``exponents`` the JSON list of ``[column, exponent]`` pairs
and ``beta`` the decimal ``β`` of the generator ``(β + √D)/2`` (``D > 0``; ``0`` for
``D < 0``), ``tasks(task INTEGER PRIMARY KEY)``.  A store written before ``beta`` existed
(for ``D < 0``) gains the column with the value 0 when it is opened.
"""

from __future__ import annotations

import json
import sqlite3
from collections.abc import Iterable
from pathlib import Path

from ..errors import FormkitError
from .relation_sieve import Relation

__all__ = ["RelationStore"]


class RelationStore:
    """Relations of ``Cl(D)`` in the factor base of bound ``bound``, kept in the SQLite file ``path``.

    Parameters
    ----------
    path : str or Path
        The file (created if missing).
    D : int
        The discriminant.
    bound : int
        The factor-base bound (the columns are the prime forms up to it, in increasing order).

    Raises
    ------
    FormkitError
        If the file cannot be opened, is not a relation store, or holds relations of another ``D`` or bound.

    Examples
    --------
    >>> import tempfile, os
    >>> path = os.path.join(tempfile.mkdtemp(), "rel.sqlite")
    >>> with RelationStore(path, -10**12 - 3, 4595) as s:
    ...     s.add([Relation(((0, 1), (3, -2)))], task=0)
    >>> with RelationStore(path, -10**12 - 3, 4595) as s:
    ...     s.relations(), s.done_tasks()
    ([Relation(exponents=((0, 1), (3, -2)), large=1, large_sign=1, beta=0)], {0})
    """

    def __init__(self, path: str | Path, D: int, bound: int) -> None:
        self.path = str(path)
        try:
            self._db = sqlite3.connect(self.path)
            self._db.execute("CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT)")
            self._db.execute(
                "CREATE TABLE IF NOT EXISTS relations (exponents TEXT, large INTEGER, sign INTEGER, beta TEXT)"
            )
            columns = [row[1] for row in self._db.execute("PRAGMA table_info(relations)")]
            if "beta" not in columns:  # a store of the first layout (D < 0 only)
                with self._db:
                    self._db.execute("ALTER TABLE relations ADD COLUMN beta TEXT DEFAULT '0'")
            self._db.execute("CREATE TABLE IF NOT EXISTS tasks (task INTEGER PRIMARY KEY)")
            meta = dict(self._db.execute("SELECT key, value FROM meta").fetchall())
        except sqlite3.DatabaseError as exc:
            raise FormkitError(f"store {self.path!r} cannot be opened as a relation store ({exc})") from None
        want = {"discriminant": str(D), "bound": str(bound), "format": "formkit-relations-1"}
        if not meta:
            with self._db:
                self._db.executemany("INSERT INTO meta VALUES (?, ?)", list(want.items()))
        elif meta != want:
            raise FormkitError(
                f"store {self.path!r} holds relations of D = {meta.get('discriminant')} with factor-base "
                f"bound {meta.get('bound')}, not D = {D} with bound {bound}; use another file"
            )

    def __enter__(self) -> RelationStore:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    def close(self) -> None:
        """Close the file."""
        self._db.close()

    def add(self, relations: Iterable[Relation], task: int | None = None) -> None:
        """Write ``relations`` (and mark ``task`` finished) in one transaction."""
        rows = [
            (
                json.dumps([[int(i), int(k)] for i, k in r.exponents]),
                int(r.large),
                int(r.large_sign),
                str(int(r.beta)),
            )
            for r in relations
        ]
        with self._db:
            self._db.executemany("INSERT INTO relations VALUES (?, ?, ?, ?)", rows)
            if task is not None:
                self._db.execute("INSERT OR IGNORE INTO tasks VALUES (?)", (task,))

    def relations(self) -> list[Relation]:
        """Every relation in the store, in the order written."""
        out = []
        for text, large, sign, beta in self._db.execute(
            "SELECT exponents, large, sign, beta FROM relations ORDER BY rowid"
        ):
            exps = tuple((int(i), int(k)) for i, k in json.loads(text))
            out.append(Relation(exps, int(large), int(sign), int(beta or 0)))
        return out

    def done_tasks(self) -> set[int]:
        """Indices of the sieve tasks already finished."""
        return {int(t) for (t,) in self._db.execute("SELECT task FROM tasks")}
