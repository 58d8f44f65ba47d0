"""C and C++: typed declarations, `auto`, members reached through `->` and `::`."""

from __future__ import annotations

import re

from ..tokens import OPERATOR, Token
from .base import words
from .java import TypedLanguage

_C_RESERVED = words("""auto break case char const continue default do double else enum extern float for goto
    if inline int long register restrict return short signed sizeof static struct switch typedef union
    unsigned void volatile while bool true false NULL""")


class C(TypedLanguage):
    name = "c"
    pygments_alias = "c"
    pygments_names = ("C",)
    reserved = _C_RESERVED
    naming_style = "snake"
    member_access = frozenset({".", "->", "::"})

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        return join_arrows(super().lex(text, keep_comments, raw))

    def read(self, text: str, tokens: list[Token]) -> tuple[list, dict]:
        # A macro's body may use a local by name (`#define op (*_op)` inside a function): those uses are
        # not tokens of the code, so no rename could reach them and such a variable is left alone.
        hidden = macro_names(text)
        variables, facts = super().read(text, tokens)
        return [v for v in variables if v.name not in hidden], facts


class CPlusPlus(C):
    name = "cpp"
    pygments_alias = "cpp"
    pygments_names = ("C++",)
    reserved = _C_RESERVED | words("class namespace template typename this new delete public private protected "
                                   "virtual nullptr auto")
    declaration_words = frozenset({"auto"})


_DEFINE = re.compile(r"^[ \t]*#[ \t]*define[ \t]+\w+(\([^)]*\))?((?:[^\n]*\\\n)*[^\n]*)", re.M)
_STRING_OR_COMMENT = re.compile(r'"(?:\\.|[^"\\\n])*"|\'(?:\\.|[^\'\\\n])*\'|/\*.*?\*/|//[^\n]*', re.S)
_WORD = re.compile(r"[A-Za-z_]\w*")


def macro_names(text: str) -> frozenset[str]:
    """Names that macro bodies use besides the macros' own parameters."""
    found: set[str] = set()
    for match in _DEFINE.finditer(text):
        own = set(_WORD.findall(match.group(1) or ""))
        found.update(set(_WORD.findall(_STRING_OR_COMMENT.sub(" ", match.group(2)))) - own)
    return frozenset(found)


def join_arrows(tokens: list[Token]) -> list[Token]:
    """`-` and `>` side by side become `->` (pygments reads C's operators one character at a time), so
    `context->dictSize` reads as a member; `count-->0` stays `--` and `>`."""
    joined: list[Token] = []
    dashes = 0  # adjacent "-" tokens just before
    for token in tokens:
        previous = joined[-1] if joined else None
        adjacent = previous is not None and previous.line == token.line and \
            previous.column + len(previous.text) == token.column
        if token.text == ">" and adjacent and dashes % 2 == 1:
            joined[-1] = Token("->", OPERATOR, previous.line, previous.column)
            dashes = 0
            continue
        dashes = (dashes + 1 if adjacent else 1) if token.text == "-" else 0
        joined.append(token)
    return joined


C_LANGUAGE = C()
CPP = CPlusPlus()
