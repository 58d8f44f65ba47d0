"""Lexing and identifier splitting."""

import pytest

from cognomen.model.tokens import (COMMENT, KEYWORD, NAME, NUMBER, OPERATOR, STRING, case_style, language_for_path,
                                   lex, split_identifier)


# Common practice: the usual naming conventions and how their parts are read.
@pytest.mark.parametrize("identifier, parts", [
    ("userName", ("user", "name")),
    ("UserName", ("user", "name")),
    ("user_name", ("user", "name")),
    ("MAX_RETRY_COUNT", ("max", "retry", "count")),
    ("HTTPServer", ("http", "server")),
    ("parseXMLFile", ("parse", "xml", "file")),
    ("utf8Decoder", ("utf", "8", "decoder")),
    ("base64", ("base", "64")),
    ("__init__", ("init",)),
    ("x", ("x",)),
    ("getHTTPResponseCode", ("get", "http", "response", "code")),
])
def test_split_identifier(identifier, parts):
    assert split_identifier(identifier) == parts


@pytest.mark.parametrize("identifier, style", [
    ("user_name", "snake"), ("userName", "camel"), ("UserName", "pascal"), ("MAX_SIZE", "screaming"),
    ("total", "lower"),
])
def test_case_style(identifier, style):
    assert case_style(identifier) == style


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


@pytest.mark.parametrize("language, source, expected", [
    ("javascript", "const total = items.length * 2;", [("const", KEYWORD), ("total", NAME), ("<num>", NUMBER)]),
    ("typescript", "let label: string = 'x';", [("let", KEYWORD), ("label", NAME), ("<str>", STRING)]),
    ("go", "count := len(rows) // rows seen", [("count", NAME), (":=", OPERATOR), ("len", NAME)]),
    ("java", "int total = 0; /* note */", [("int", NAME), ("total", NAME), ("<num>", NUMBER)]),
    ("rust", "let mut total = 0u32;", [("let", KEYWORD), ("mut", KEYWORD), ("total", NAME)]),
    ("c", "int count = 42; // answer", [("count", NAME), ("<num>", NUMBER)]),
    ("csharp", "var name = \"x\";", [("name", NAME), ("<str>", STRING)]),
])
def test_other_languages(language, source, expected):
    tokens = kinds(source, language)
    for pair in expected:
        assert pair in tokens
    assert all(kind != COMMENT for _, kind in tokens)


def test_language_from_file_name_only():
    assert language_for_path("a.py") == "python"
    assert language_for_path("b.tsx") == "typescript"
    assert language_for_path("c.go") == "go"
    assert language_for_path("README.md") is None
    assert language_for_path("Makefile") is None


def test_the_fast_python_scanner_yields_what_tokenize_yields_on_the_standard_library():
    """Every fifth module of the running Python's standard library (tests included: they hold the
    odd cases), in both modes; the scanner may hand a file to tokenize, but never disagree."""
    from cognomen.model.tokens import _UNUSUAL, _scan_python, _tokenize_python

    from .conftest import STDLIB
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
    from cognomen.model.tokens import lex_python
    assert lex_python(text, False, False) is None
