"""Variables and scopes: Python against the standard library's symtable, other languages by example."""

import symtable
import warnings

import pytest

from cognomen.model.scopes import LOCAL, PARAMETER, find_variables
from cognomen.model.tokens import lex

from .conftest import STDLIB

REAL_FILES = ["shutil.py", "tarfile.py", "configparser.py", "json/decoder.py", "argparse.py", "textwrap.py",
              "email/message.py", "collections/__init__.py"]


def symtable_locals(text):
    """(function name, line, local name) for every function scope, straight from symtable."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        top = symtable.symtable(text, "<file>", "exec")
    found = set()
    pending = list(top.get_children())
    while pending:
        table = pending.pop()
        pending.extend(table.get_children())
        if table.get_type() != "function" or table.get_name() in ("listcomp", "setcomp", "dictcomp", "genexpr"):
            continue
        for symbol in table.get_symbols():
            if (symbol.is_local() or symbol.is_parameter()) and not symbol.is_imported() \
                    and not symbol.is_namespace() and symbol.get_name() not in ("self", "cls"):
                found.add((table.get_lineno(), symbol.get_name()))
    return found


@pytest.mark.parametrize("relative", REAL_FILES)
def test_python_locals_agree_with_symtable(relative):
    text = (STDLIB / relative).read_text(encoding="utf-8")
    tokens = lex(text, "python")
    variables = find_variables(text, tokens, "python")
    ours = {(v.scope_start, v.name) for v in variables if v.scope_kind == "function" and v.name not in ("self", "cls")}
    expected = symtable_locals(text)
    # Locals that are bound but never appear as a name token (for example `del` only) are rare;
    # every local symtable reports must be found, and nothing else.
    missing = expected - ours
    extra = ours - expected
    assert not extra, f"not locals per symtable: {sorted(extra)[:5]}"
    assert len(missing) <= len(expected) * 0.01, f"missed: {sorted(missing)[:5]}"


def test_every_occurrence_is_the_same_text():
    text = (STDLIB / "shutil.py").read_text(encoding="utf-8")
    tokens = lex(text, "python")
    for variable in find_variables(text, tokens, "python"):
        assert all(tokens[i].text == variable.name for i in variable.occurrences)


def test_python_scopes_closures_comprehensions_and_excepts():
    text = '''
def outer(items, limit=3):
    total = 0
    def inner(step):
        return total + step
    squares = [item * item for item in items]
    try:
        pass
    except ValueError as error:
        print(error)
    match limit:
        case int(bound):
            total = bound
    return inner, squares
'''
    tokens = lex(text, "python")
    variables = {(v.function, v.name): v for v in find_variables(text, tokens, "python")}
    assert variables[("outer", "items")].kind == PARAMETER
    assert variables[("outer", "items")].public_parameter
    total = variables[("outer", "total")]
    assert len(total.occurrences) == 3, "the closure's use belongs to the outer variable"
    assert ("inner", "step") in variables
    assert ("outer", "item") in variables, "comprehension targets are variables of their own scope"
    assert len(variables[("outer", "error")].occurrences) == 2
    assert len(variables[("outer", "bound")].occurrences) == 2
    assert "inner" not in {name for _, name in variables}, "nested function names are not variables"


def test_syntax_error_falls_back_to_tokens():
    text = "def broken(value):\n    total = value +\n    return total\n"
    tokens = lex(text, "python")
    names = {v.name for v in find_variables(text, tokens, "python")}
    assert {"value", "total"} <= names


def positions(text, language):
    tokens = lex(text, language)
    return {v.name: (v.kind, [(tokens[i].line, tokens[i].column) for i in v.occurrences])
            for v in find_variables(text, tokens, language)}


def test_typescript_bindings():
    found = positions("function add(cart, item, quantity = 1) {\n  const total = cart.total + item.price;\n"
                      "  let count = 0;\n  for (const line of cart.lines) { count += line.quantity; }\n"
                      "  return { total: total, count };\n}\n", "typescript")
    assert found["cart"][0] == PARAMETER and len(found["cart"][1]) == 3
    assert found["total"] == (LOCAL, [(2, 9), (5, 19)]), "object keys and members are not uses"
    assert len(found["count"][1]) == 3
    assert found["line"][0] == LOCAL


def test_go_bindings():
    found = positions("package main\nfunc (s *Server) Handle(req *Request) error {\n\tcount := 0\n"
                      "\tfor i, item := range req.Items { count += item.N + i }\n\treturn nil\n}\n", "go")
    assert found["req"][0] == PARAMETER and len(found["req"][1]) == 2
    assert len(found["count"][1]) == 2
    assert {"i", "item"} <= set(found)


def test_java_bindings_skip_fields():
    found = positions("class A { private int field;\n public int sum(List<Integer> values, int start) {\n"
                      "  int total = start;\n  for (int value : values) { total += value; }\n  return total;\n } }",
                      "java")
    assert "field" not in found
    assert found["values"][0] == PARAMETER and len(found["values"][1]) == 2
    assert len(found["total"][1]) == 3


def test_rust_and_c_bindings():
    rust = positions("fn area(width: u32, height: u32) -> u32 {\n    let mut total = width * height;\n"
                     "    total += 1;\n    total\n}\n", "rust")
    assert rust["width"][0] == PARAMETER and len(rust["total"][1]) == 3
    c = positions("int sum(int *values, int count) {\n  int total = 0;\n  for (int i = 0; i < count; i++) "
                  "{ total += values[i]; }\n  return total;\n}\n", "c")
    assert c["count"][0] == PARAMETER and len(c["total"][1]) == 3 and "i" in c


# --- reading Python one top-level statement at a time (what the editor does on every edit) ---

def _fingerprint(tokens, variables):
    return tokens, [(v.name, v.kind, v.occurrences, v.scope_start, v.scope_end, v.function, v.public_parameter,
                     v.bound_names, v.scope_kind) for v in variables]


# Real standard-library files: large classes, module docstrings with text flush left, decorators,
# `from __future__ import annotations` (tomllib, dataclasses' helpers), top-level if/else and try/except.
PIECEWISE_FILES = REAL_FILES + ["tomllib/_parser.py", "dataclasses.py", "typing.py", "doctest.py", "os.py",
                                "ssl.py", "zipfile.py", "pydoc.py"]


@pytest.mark.parametrize("relative", PIECEWISE_FILES)
def test_reading_piece_by_piece_equals_reading_the_whole_file(relative):
    from cognomen.model.chunks import read_python
    text = (STDLIB / relative).read_text(encoding="utf-8")
    tokens = lex(text, "python")
    whole = _fingerprint(tokens, find_variables(text, tokens, "python"))
    assert _fingerprint(*read_python(text)) == whole


def test_reused_pieces_give_what_a_fresh_reading_gives_after_edits():
    from cognomen.model.chunks import PieceCache, read_python
    lines = (STDLIB / "argparse.py").read_text(encoding="utf-8").split("\n")
    cache = PieceCache()
    read_python("\n".join(lines), cache)
    # An edit inside a method, a line inserted (everything below moves), a line removed.
    lines[700] += "  # edited"
    lines.insert(300, "    extra_setting = 1")
    del lines[1500]
    text = "\n".join(lines)
    assert _fingerprint(*read_python(text, cache)) == _fingerprint(*read_python(text))


def test_a_syntax_error_stays_in_its_own_statement():
    from cognomen.model.chunks import read_python
    text = (STDLIB / "textwrap.py").read_text(encoding="utf-8")
    broken = text.replace("def dedent(text):", "def dedent(text:", 1)
    assert broken != text
    tokens, variables = read_python(broken)
    exact = {(v.scope_start, v.name) for v in find_variables(text, lex(text, "python"), "python")
             if v.function == "wrap"}
    # `wrap` is far from the broken `dedent`: still read exactly (the whole-file reading would
    # fall back to token rules for every function).
    assert exact and exact <= {(v.scope_start, v.name) for v in variables if v.function == "wrap"}
