"""Python: lexing against tokenize, locals against symtable (both the standard library's own),
hand-worked scopes, and the interpreter as the judge of every rename."""

import symtable
import warnings

import pytest

from cognomen.model.languages import lex
from cognomen.model.scopes import PARAMETER, find_variables
from cognomen.model.tokens import COMMENT, KEYWORD, NAME, NUMBER, OPERATOR, STRING

from ..conftest import STDLIB
from .snippets import cues, rename, run, variable_list


def kinds(text, language):
    return [(t.text, t.kind) for t in lex(text, language)]


def test_python_kinds_and_literal_abstraction():
    tokens = kinds('total = count + 3  # running "sum"\nname = f"{first} {last}"\n', "python")
    assert ("total", NAME) in tokens and ("=", OPERATOR) in tokens and ("<num>", NUMBER) in tokens
    assert ("<str>", STRING) in tokens
    assert all(kind != COMMENT for _, kind in tokens), "comments are dropped"
    assert not any("sum" in text for text, _ in tokens), "comment text never survives"
    assert ("first", NAME) in tokens, "f-string fields keep their names"


def test_python_keywords_and_positions():
    tokens = lex("\n\ndef f(x):\n    return x is None\n", "python")
    assert (tokens[0].text, tokens[0].kind, tokens[0].line, tokens[0].column) == ("def", KEYWORD, 3, 1)
    returned = [t for t in tokens if t.text == "x"][1]
    assert (returned.line, returned.column) == (4, 12)
    assert [t.kind for t in tokens if t.text in ("is", "None")] == [KEYWORD, KEYWORD]


def test_the_fast_python_scanner_yields_what_tokenize_yields_on_the_standard_library():
    """Every fifth module of the running Python's standard library (tests included: they hold the
    odd cases), in both modes; the scanner may hand a file to tokenize, but never disagree."""
    from cognomen.model.languages.python import _UNUSUAL, _scan_python, _tokenize_python

    files = sorted(p for p in STDLIB.rglob("*.py") if "site-packages" not in p.parts)[::5]
    scanned = 0
    for path in files:
        try:
            text = path.read_text(encoding="utf-8")
        except (UnicodeDecodeError, OSError):
            continue
        for raw in (False, True):
            fast = _scan_python(text, False, raw)
            if fast is _UNUSUAL:
                continue
            scanned += 1
            assert fast == _tokenize_python(text, False, raw), path
    assert scanned > len(files)


@pytest.mark.parametrize("text", ["x = (1,\n", "x = 1 + \\\n", 'x = """open\n', "values = [\n    1,\n"])
def test_python_ending_inside_brackets_or_strings_does_not_lex(text):
    from cognomen.model.languages.python import lex_python
    assert lex_python(text, False, False) is None


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


PROGRAM = """\
import json


def summarise(readings, *, limit=3, **options):
    total = 0
    seen = {zone for zone, _ in readings}
    for zone, level in readings[:limit]:
        total += level
    ranked = sorted(readings, key=lambda pair: pair[1])
    try:
        json.loads("{")
    except ValueError as problem:
        options["error"] = type(problem).__name__

    def scaled(factor):
        return total * factor

    report = dict(total=total, zones=len(seen), top=ranked[-1][0], doubled=scaled(2))
    report.update(options)
    return f"{report['total']}:{json.dumps(report, sort_keys=True)}"


print(summarise([("north", 4), ("south", 7), ("west", 1)], limit=2, source="bench"))
"""


def test_renaming_every_local_keeps_the_program_working(tmp_path):
    before = run("python", PROGRAM, tmp_path / "before")
    assert before.startswith('11:{"doubled": 22, "error": "JSONDecodeError"')
    found = variable_list(PROGRAM, "python")
    # A keyword argument `limit=2` names the parameter: renaming `limit` would break that caller,
    # which is why the editor's quick fix warns about public parameters.
    limit = next(v for v in find_variables(PROGRAM, lex(PROGRAM, "python"), "python") if v.name == "limit")
    assert limit.kind == PARAMETER and limit.public_parameter
    renames = {name: f"{name}_renamed" for name, _, _ in found if name not in ("limit", "_")}
    after = rename(PROGRAM, "python", renames)
    assert "dict(total=total_renamed," in after, "a keyword argument's name is not a use"
    assert run("python", after, tmp_path / "after") == before


FLOW = '''\
import os


def open_session(settings, frames, rows):
    session = create_session(settings.url, timeout=settings.timeout)
    frame = frames.get(settings.key)
    row = rows[0]
    cmd = settings.args.get("cmd")
    home = os.environ.get("HOME")
    retries = settings.retries
    users = []
    for user in session.users:
        users.append(user)
    send(session, frame, row)
    settings.home = home
    return users
'''


def test_flow_cues_worked_by_hand():
    found = cues(FLOW, "flow.py", "python")
    assert found["session"] >= {"call:create_session", "argument:send#0"}
    assert found["frame"] >= {"call:get", "receiver:frames", "argument:send#1"}
    assert "receiver:rows" in found["row"], "an item of `rows`"
    assert "key:cmd" in found["cmd"] and "key:HOME" in found["home"], "a string key names the value it reads"
    assert "store:home" in found["home"], "`settings.home = home`"
    assert "attribute:retries" in found["retries"]
    assert "iterated:users" in found["user"] and "added_to:users" in found["user"]
    assert {"holds:user", "returned:open_session"} <= found["users"]
    assert {"parameter:open_session#0", "parameter:open_session#1"} <= found["settings"] | found["frames"]
    # Never from the variable's own occurrences: `timeout=settings.timeout` names the keyword, not settings.
    assert "keyword:timeout" not in found["settings"]


def test_a_keyword_bag_names_its_keys_not_its_values():
    text = ("def build(**fields):\n    pairs = []\n    for key, value in fields.items():\n        pairs.append(value)\n"
            "    for entry in fields.values():\n        pairs.append(entry)\n    for name in fields:\n"
            "        pairs.append(name)\n    return pairs\n\n\n"
            "def walk(fields):\n    for label, field in fields.items():\n        print(label, field)\n")
    found = cues(text, "bag.py", "python")
    assert "key_of:fields" in found["key"], "the keys of a `**fields` bag are keyword names"
    assert not any(cue.startswith("iterated:") for cue in found["value"] | found["entry"]), \
        "what callers pass in a `**fields` bag may be anything"
    assert "key_of:fields" in found["name"], "iterating the bag gives its keys"
    assert "iterated:fields" in found["field"], "a plain mapping's values still get their collection's cue"


def test_a_value_whose_kind_the_code_tests_is_marked_and_not_counted():
    from cognomen.model.corpus import analyse
    from cognomen.model.flow import index_cues
    text = ("def parse(*expressions):\n    return [arg if hasattr(arg, 'resolve') else wrap(arg)\n"
            "            for arg in expressions]\n")
    arg = next(v for v in analyse(text, "parse.py", "python").variables if v.name == "arg")
    assert {"checked:hasattr", "iterated:expressions"} <= set(arg.cues)
    assert "checked:hasattr" not in index_cues(arg.cues), "a test of kind names no value: the index never counts it"


def test_a_constructors_parameters_are_indexed_under_its_class():
    found = cues("class Meter:\n    def __init__(self, port, scale=1):\n        self.port = port\n\n"
                 "def make(device):\n    return Meter(device)\n", "meter.py", "python")
    assert "parameter:Meter#0" in found["port"] and "store:port" in found["port"]
    assert "argument:Meter#0" in found["device"], "callers write `Meter(...)`: the cross cue meets the parameter"
