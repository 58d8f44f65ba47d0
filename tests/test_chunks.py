"""Reading Python one top-level statement at a time (what the editor does on every edit), against
reading the whole file, on real standard-library files."""

import pytest

from cognomen.model.chunks import PieceCache, read_python
from cognomen.model.languages import lex
from cognomen.model.scopes import find_variables

from .conftest import STDLIB
from .languages.test_python import REAL_FILES


def _fingerprint(tokens, variables, facts=None):
    return tokens, [(v.name, v.kind, v.occurrences, v.scope_start, v.scope_end, v.function, v.public_parameter,
                     v.bound_names, v.scope_kind, v.dictated, v.owner, v.cues) for v in variables]


# Real standard-library files: large classes, module docstrings with text flush left, decorators,
# `from __future__ import annotations` (tomllib, dataclasses' helpers), top-level if/else and try/except.
PIECEWISE_FILES = REAL_FILES + ["tomllib/_parser.py", "dataclasses.py", "typing.py", "doctest.py", "os.py",
                                "ssl.py", "zipfile.py", "pydoc.py"]


@pytest.mark.parametrize("relative", PIECEWISE_FILES)
def test_reading_piece_by_piece_equals_reading_the_whole_file(relative):
    text = (STDLIB / relative).read_text(encoding="utf-8")
    tokens = lex(text, "python")
    whole = _fingerprint(tokens, find_variables(text, tokens, "python"))
    assert _fingerprint(*read_python(text)) == whole


def test_reused_pieces_give_what_a_fresh_reading_gives_after_edits():
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
    text = (STDLIB / "textwrap.py").read_text(encoding="utf-8")
    broken = text.replace("def dedent(text):", "def dedent(text:", 1)
    assert broken != text
    tokens, variables, _ = read_python(broken)
    exact = {(v.scope_start, v.name) for v in find_variables(text, lex(text, "python"), "python")
             if v.function == "wrap"}
    # `wrap` is far from the broken `dedent`: still read exactly (the whole-file reading would
    # fall back to token rules for every function).
    assert exact and exact <= {(v.scope_start, v.name) for v in variables if v.function == "wrap"}
