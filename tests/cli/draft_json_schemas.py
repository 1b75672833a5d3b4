"""Draft the JSON Schema files of formkit/cli/schemas from observed outputs (run by hand:
``python tests/cli/draft_json_schemas.py``).  The draft infers types from the help examples
and the random inputs of ``_json_schemas``; the files are then read and edited by hand
(descriptions, enumerations), so re-running overwrites only files that do not exist yet."""

from __future__ import annotations

import contextlib
import io
import json
import os
import sys
import tempfile

sys.path.insert(0, os.path.dirname(__file__))
from _json_schemas import examples, is_slow, random_argvs, schema_path

from formkit.cli import main

TYPE = {bool: "boolean", int: "integer", float: "number", str: "string", type(None): "null"}


def infer(values):
    types = set()
    objs, arrs = [], []
    for v in values:
        if isinstance(v, dict):
            types.add("object")
            objs.append(v)
        elif isinstance(v, list):
            types.add("array")
            arrs.append(v)
        else:
            types.add(TYPE[type(v)])
    if "integer" in types and "number" in types:
        types.discard("integer")
    s: dict = {"type": sorted(types)[0] if len(types) == 1 else sorted(types)}
    if objs:
        keys = sorted({k for o in objs for k in o})
        s["properties"] = {k: infer([o[k] for o in objs if k in o]) for k in keys}
        req = [k for k in keys if all(k in o for o in objs)]
        if req:
            s["required"] = req
    if arrs:
        items = [x for a in arrs for x in a]
        if items:
            s["items"] = infer(items)
    return s


def run(argv):
    buf = io.StringIO()
    with contextlib.redirect_stdout(buf), contextlib.redirect_stderr(io.StringIO()):
        code = main(argv)
    assert code == 0, argv
    return json.loads(buf.getvalue())


def main_():
    seen: dict = {}
    with tempfile.TemporaryDirectory() as tmp:
        os.chdir(tmp)
        for path, argv in examples() + random_argvs():
            if is_slow(argv):
                continue
            seen.setdefault(path, []).append(run(argv))
    for path, outs in seen.items():
        p = schema_path(path)
        if p.exists():
            continue
        s = infer(outs)
        s["additionalProperties"] = False
        schema = {
            "$schema": "https://json-schema.org/draft/2020-12/schema",
            "title": f"formkit {' '.join(path)} --json",
            **s,
        }
        p.write_text(json.dumps(schema, indent=1, ensure_ascii=False) + "\n", encoding="utf-8")
        print("wrote", p)


if __name__ == "__main__":
    main_()
