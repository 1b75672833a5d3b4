"""Every command's ``--json`` output against its JSON Schema (issue 15, "one data model").

The schemas ship in the package (``formkit/cli/schemas/<command>.json``, described in
docs/json.md).  Checked here, with jsonschema as the validator (an outside reference):

* every command has a schema, and every schema belongs to a command;
* the help examples of every command validate (the slow table examples with ``-m slow``);
* random inputs (a seed other than the one the drafts were made from) validate;
* one key, one type: a key that appears at the top level of several schemas has the same
  type in all of them (``count`` is an integer everywhere, forms are arrays …).
"""

from __future__ import annotations

import contextlib
import io
import json

import pytest
from _json_schemas import SCHEMA_DIR, examples, is_slow, leaves, random_argvs, schema_path

from formkit.cli import main

jsonschema = pytest.importorskip("jsonschema")

LEAVES = [path for path, _ in leaves()]


def _schema(path):
    return json.loads(schema_path(path).read_text(encoding="utf-8"))


def _run(argv):
    buf = io.StringIO()
    with contextlib.redirect_stdout(buf), contextlib.redirect_stderr(io.StringIO()):
        code = main(argv)
    assert code == 0, argv
    text = buf.getvalue()
    assert text.count("\n") == 1, "one JSON object on one line"
    return json.loads(text)


def test_every_command_has_a_schema():
    assert sorted(p.name for p in SCHEMA_DIR.glob("*.json")) == sorted(
        schema_path(path).name for path in LEAVES
    )
    for path in LEAVES:
        jsonschema.Draft202012Validator.check_schema(_schema(path))


_EXAMPLES = [
    pytest.param(path, argv, marks=[pytest.mark.slow] if is_slow(argv) else [], id=" ".join(argv))
    for path, argv in examples()
    if "tcp://" not in " ".join(argv)  # needs a running Dask scheduler
]


@pytest.mark.parametrize("path,argv", _EXAMPLES)
def test_help_examples_validate(path, argv, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)  # examples with -o FILE write here
    if "--db" in argv and not any(a in argv for a in ("--from", "--to")):
        pytest.skip("queries a store that an earlier example builds")
    jsonschema.validate(_run(argv), _schema(path))


@pytest.mark.parametrize("path,argv", random_argvs(seed=1915, n=2), ids=lambda x: " ".join(x))
def test_random_inputs_validate(path, argv, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    jsonschema.validate(_run(argv), _schema(path))


def test_one_key_one_type():
    types: dict = {}
    for path in LEAVES:
        for key, sub in _schema(path).get("properties", {}).items():
            t = sub.get("type")
            t = {t} if isinstance(t, str) else set(t or ())
            t.discard("null")  # absent quantities are null everywhere
            types.setdefault(key, {})[" ".join(path)] = frozenset(t)
    clashes = {k: v for k, v in types.items() if len(set(v.values()) - {frozenset()}) > 1}
    assert not clashes, clashes


def test_schema_rejects_drift():
    # a schema that cannot fail would prove nothing: a renamed key or a changed type is caught
    d = _run(["group", "-23", "--json"])
    schema = _schema(("group",))
    jsonschema.validate(d, schema)
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate({**d, "nodes": 3}, schema)
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate({**d, "class_number": "3"}, schema)


def _properties(schema, path=()):
    """(path, key, subschema) of every property of a schema, nested ones included."""
    if not isinstance(schema, dict):
        return
    for key, sub in schema.get("properties", {}).items():
        yield path, key, sub
        yield from _properties(sub, (*path, key))
    for kk in ("items", "additionalProperties"):
        if isinstance(schema.get(kk), dict):
            yield from _properties(schema[kk], (*path, "[]"))
    for kk in ("anyOf", "oneOf", "allOf"):
        for sub in schema.get(kk, []):
            yield from _properties(sub, path)


@pytest.mark.parametrize("path", LEAVES, ids=lambda p: " ".join(p))
def test_every_property_is_described(path):
    # issue 15: the schemas document the data model; every key says what it holds
    props = list(_properties(_schema(path)))
    assert props, "a schema with no properties"
    missing = ["/".join((*p, k)) for p, k, sub in props if not str(sub.get("description", "")).strip()]
    assert missing == []
