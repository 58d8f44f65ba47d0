"""Lexing and identifier splitting."""

from pathlib import Path

import pytest

from cognomen.model.languages import language_for_path, lex
from cognomen.model.tokens import COMMENT, KEYWORD, NAME, NUMBER, OPERATOR, STRING, case_style, split_identifier


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


def test_language_by_file_name_agrees_with_pygments_on_real_names():
    """The per-pattern shortcut gives pygments' own answer: checked against pygments'
    get_lexer_for_filename on every file name under the running Python's standard library
    and on names its patterns treat specially."""
    import sysconfig

    from pygments.lexers import get_lexer_for_filename
    from pygments.util import ClassNotFound

    from cognomen.model.languages import _BY_LEXER

    def pygments_says(name):
        try:
            return _BY_LEXER.get(get_lexer_for_filename(name).name)
        except ClassNotFound:
            return None

    names = {path.name for path in Path(sysconfig.get_paths()["stdlib"]).rglob("*")}
    names |= {"a.d.ts", "b.mts", "c.h", "d.hpp", "e.cc", "f.cs", "g.rs", "h.go", "I.java", "j.mjs", "k.pyi",
              "l.pyw", "Makefile", "CMakeLists.txt", "bashrc", "x.1", "SConstruct", "noextension", "m.PY"}
    assert len(names) > 1000
    assert {name: language_for_path(name) for name in names} == {name: pygments_says(name) for name in names}
