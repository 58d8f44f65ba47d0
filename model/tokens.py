"""Source text to normalised tokens: literals abstracted, comments dropped, names split."""

from __future__ import annotations

import functools
import re
from typing import NamedTuple

from pygments.token import Comment, Error, Keyword, Literal, Name, Number, Operator, Punctuation, String, Text

STRING_TOKEN = "<str>"
NUMBER_TOKEN = "<num>"
UNKNOWN_TOKEN = "<unk>"

KEYWORD = "keyword"
OPERATOR = "operator"
NAME = "name"
STRING = "string"
NUMBER = "number"
COMMENT = "comment"
KINDS = (KEYWORD, OPERATOR, NAME, STRING, NUMBER, COMMENT)


class Token(NamedTuple):
    """One lexed token: normalised text, kind and 1-based position (column in characters)."""

    text: str
    kind: str
    line: int
    column: int


@functools.lru_cache(maxsize=32)
def _lexer(alias: str):
    from pygments.lexers import get_lexer_by_name

    # stripnl=False keeps line numbers aligned with the file (and with ast).
    return get_lexer_by_name(alias, stripnl=False, ensurenl=False)


@functools.lru_cache(maxsize=1024)
def token_kind(ttype) -> str | None:
    """Our kind for a pygments token type; None for white space and errors."""
    if ttype in Comment or ttype in String.Doc or ttype in Comment.Preproc:
        return COMMENT
    if ttype in String or ttype in Literal.String:
        return STRING
    if ttype in Number:
        return NUMBER
    if ttype in Keyword.Type:
        # Type names (and, in some lexers, plain names after ":") behave as identifiers.
        return NAME
    if ttype in Keyword:
        return KEYWORD
    if ttype in Operator.Word:
        return KEYWORD
    if ttype in Name.Builtin.Pseudo:
        return NAME
    if ttype in Name:
        return NAME
    if ttype in Operator or ttype in Punctuation:
        return OPERATOR
    if ttype in Text or ttype in Error:
        return None
    if ttype in Literal:
        return STRING
    return None


def lex_with_pygments(text: str, alias: str, keep_comments: bool = False, raw: bool = False,
                      lexer=None) -> list[Token]:
    """Normalised tokens from the pygments lexer named `alias` (or the given lexer object).

    String fragments merge into one STRING_TOKEN, numbers become NUMBER_TOKEN, comments
    are dropped unless asked for (then their text is replaced by the kind, never kept).
    With raw=True (for vocabulary statistics only) literals and comments keep their text.
    """
    tokens: list[Token] = []
    line, column = 1, 1
    previous_kind = None
    for _, ttype, value in (lexer or _lexer(alias)).get_tokens_unprocessed(text):
        kind = token_kind(ttype)
        start_line, start_column = line, column
        newlines = value.count("\n")
        if newlines:
            line += newlines
            column = len(value) - value.rfind("\n")
        else:
            column += len(value)
        if kind is None:
            if value.strip() and ttype in Error and value.isidentifier():
                kind = NAME
            else:
                continue
        stripped = value.strip()
        if not stripped:
            continue
        if kind == COMMENT:
            if keep_comments or raw:
                tokens.append(Token(stripped if raw else "<comment>", COMMENT, start_line, start_column))
            previous_kind = COMMENT
            continue
        if kind == STRING:
            previous_kind = add_string(tokens, previous_kind, value, start_line, start_column, raw)
            continue
        if kind == NUMBER:
            tokens.append(Token(stripped if raw else NUMBER_TOKEN, NUMBER, start_line, start_column))
        elif stripped == ":" and tokens and tokens[-1].text == ":" and tokens[-1].line == start_line and \
                tokens[-1].column + 1 == start_column + len(value) - len(value.lstrip()):
            tokens[-1] = Token("::", OPERATOR, tokens[-1].line, tokens[-1].column)  # C++ reads a path in halves
        elif kind == OPERATOR and len(stripped) > 1 and not _is_operator(stripped):
            # Punctuation runs such as "):" arrive as one value in some lexers: split them.
            offset = value.index(stripped[0])
            for i, char in enumerate(stripped):
                if not char.isspace():
                    tokens.append(Token(char, OPERATOR, start_line, start_column + offset + i))
        else:
            leading = len(value) - len(value.lstrip())
            if kind == NAME and not stripped.replace("$", "_").isidentifier():
                if not any(c.isalnum() for c in stripped):
                    kind = OPERATOR
                elif _GLUED.fullmatch(stripped):
                    # Some lexers glue an operator to a name (TypeScript's `third?` and `...args`):
                    # the binding is the identifier alone.
                    for part in _GLUED_PART.finditer(stripped):
                        piece = part.group(0)
                        tokens.append(Token(piece, NAME if part.lastgroup == "name" else OPERATOR, start_line,
                                            start_column + leading + part.start()))
                    previous_kind = tokens[-1].kind
                    continue
            tokens.append(Token(stripped, kind, start_line, start_column + leading))
        previous_kind = kind
    return tokens


_GLUED = re.compile(r"(?:\.\.\.)?[A-Za-z_$][\w$]*[?!]?")
_GLUED_PART = re.compile(r"(?P<name>[A-Za-z_$][\w$]*)|(?P<operator>\.\.\.|[?!])")


def add_string(tokens: list[Token], previous_kind: str | None, value: str, line: int, column: int,
                raw: bool) -> str:
    """Adjacent string fragments become one string token (its text kept only when raw)."""
    if previous_kind != STRING:
        tokens.append(Token(value if raw else STRING_TOKEN, STRING, line, column))
    elif raw:
        merged = tokens[-1]
        tokens[-1] = Token(merged.text + value, STRING, merged.line, merged.column)
    return STRING


_OPERATORS = {
    "==", "!=", "<=", ">=", "->", "=>", "::", "**", "//", "&&", "||", "++", "--", "+=", "-=",
    "*=", "/=", "%=", "&=", "|=", "^=", "<<", ">>", ":=", "...", "===", "!==", "**=", "//=",
    ">>=", "<<=", "?.", "??", "??=", "<-", "..", "..=", "@=", ">>>",
}


def _is_operator(value: str) -> bool:
    return value in _OPERATORS


_SPLIT = re.compile(r"[A-Z]+(?=[A-Z][a-z])|[A-Z]?[a-z]+|[A-Z]+|\d+")


@functools.lru_cache(maxsize=200_000)
def split_identifier(identifier: str) -> tuple[str, ...]:
    """Sub-tokens of an identifier, lower-cased: camelCase, PascalCase, snake_case, digits, acronyms."""
    return tuple(part.lower() for part in _SPLIT.findall(identifier))


def case_style(identifier: str) -> str:
    """The naming convention an identifier is written in."""
    core = identifier.strip("_")
    if not core:
        return "other"
    if "_" in core:
        if core.upper() == core and any(c.isalpha() for c in core):
            return "screaming"
        if core.lower() == core:
            return "snake"
        return "mixed"
    if core.lower() == core:
        return "lower"
    if core.upper() == core:
        return "screaming" if len(core) > 1 else "pascal"
    if core[0].isupper():
        return "pascal"
    return "camel"


def fits_style(identifier: str, style: str) -> bool:
    """True when an identifier can be written in the given dominant style; a single letter (`G`,
    `i`) is shorthand and fits any."""
    if len(identifier.strip("_")) == 1:
        return True
    own = case_style(identifier)
    if own == style:
        return True
    if own == "lower":
        return style in ("snake", "camel", "lower")
    return False


def join_subtokens(parts: list[str] | tuple[str, ...], style: str) -> str:
    """Write sub-tokens as one identifier in a naming style."""
    if not parts:
        return ""
    if style == "camel":
        return parts[0] + "".join(p.capitalize() for p in parts[1:])
    if style == "pascal":
        return "".join(p.capitalize() for p in parts)
    if style == "screaming":
        return "_".join(p.upper() for p in parts)
    return "_".join(parts)
