"""Python: exact scopes from ast + symtable (python_scopes.py), keyword arguments, snake_case.

Python is lexed by one regular expression over the whole text, which yields what the standard
library's tokenize yields, about three times faster; tokenize decides anything unusual, and
pygments reads what tokenize cannot (a file cut off inside a string).
"""

from __future__ import annotations

import builtins
import io
import keyword
import re
import tokenize

from ..tokens import (COMMENT, KEYWORD, NAME, NUMBER, NUMBER_TOKEN, OPERATOR, STRING, Token, add_string,
                      lex_with_pygments)
from .base import Language

PYTHON_BUILTINS = frozenset(dir(builtins))
PYTHON_KEYWORDS = frozenset(keyword.kwlist) | frozenset(keyword.softkwlist)


class Python(Language):
    name = "python"
    pygments_alias = "python"
    pygments_names = ("Python",)
    reserved = PYTHON_KEYWORDS | PYTHON_BUILTINS
    receivers = frozenset({"self", "cls"})
    keyword_arguments = True
    naming_style = "snake"
    comment_prefix = "#"
    generated_suffixes = ("_pb2.py", "_pb2_grpc.py")
    defining_words = frozenset({"def"})
    binding_before = (re.compile(r"^\s*$"), re.compile(r"\bfor\s+([A-Za-z_]\w*\s*,\s*)*$"),
                      re.compile(r"\b(as)\s+$"), re.compile(r"\bdef\s+\w+\s*\((.*,)?\s*\**$"))

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        fast = lex_python(text, keep_comments, raw)
        if fast is not None:
            return fast
        return lex_with_pygments(text, "python", keep_comments, raw)

    def read(self, text: str, tokens: list[Token]) -> tuple[list, dict]:
        from .python_scopes import python_token_variables, python_variables

        try:
            return python_variables(text, tokens)
        except (SyntaxError, ValueError, RecursionError, MemoryError):
            return python_token_variables(tokens), {}


PYTHON = Python()


_PYTHON_KEYWORDS = frozenset(keyword.kwlist)  # hard keywords only: soft ones lex as names
_PYGMENTS_OPERATOR = re.compile(r"!=|==|<<|>>|:=|.")


def _is_docstring(value: str, line_text: str, offset: int) -> bool:
    prefix = value[: len(value) - len(value.lstrip("rRuUbB"))]
    body = value[len(prefix):]
    return len(prefix) <= 2 and body[:3] in ('"""', "\'\'\'") and not line_text[:offset].strip()
_SKIPPED = {tokenize.NEWLINE, tokenize.NL, tokenize.INDENT, tokenize.DEDENT, tokenize.ENDMARKER}
_STRING_PARTS = {tokenize.STRING} | {getattr(tokenize, name) for name in ("FSTRING_START", "FSTRING_MIDDLE",
                                                                         "FSTRING_END") if hasattr(tokenize, name)}


def lex_python(text: str, keep_comments: bool, raw: bool) -> list[Token] | None:
    """Python tokens; None when the text ends inside a string or brackets or tokenize cannot read it."""
    fast = _scan_python(text, keep_comments, raw)
    if fast is not _UNUSUAL:
        return fast
    return _tokenize_python(text, keep_comments, raw)


# One regular expression over the whole text yields what tokenize yields, about three times
# faster; anything out of the ordinary (a stray character, a string left open on its line)
# is left to tokenize itself. Whitespace is consumed before each token.
_STRING_BODY = (r"""(?:'''(?:[^'\\]|\\.|'(?!''))*'''|\"\"\"(?:[^"\\]|\\.|"(?!""))*\"\"\""""
                r"""|(?!''')'(?:[^'\\\n]|\\.)*'|(?!\"\"\")"(?:[^"\\\n]|\\.)*")""")
_SCAN = re.compile(
    r"[ \t\f]*(?:(?P<newline>\r?\n|\r)|(?P<continuation>\\\r?\n)|(?P<comment>#[^\r\n]*)"
    rf"|(?P<string>{tokenize.StringPrefix}{_STRING_BODY})"
    rf"|(?P<number>{re.sub(r'[(](?![?])', '(?:', tokenize.Number)})"
    r"|(?P<name>\w+)|(?P<at>@)|(?P<operator>(?:[-+*/%&|^~<>=!:;,()\[\]{}]|\.(?![0-9]))+)|(?P<end>\Z)|(?P<unusual>.))",
    re.DOTALL)
_OPENING, _CLOSING = frozenset("([{"), frozenset(")]}")
_UNUSUAL = object()


def _scan_python(text: str, keep_comments: bool, raw: bool):
    """Tokens as `_tokenize_python` gives them; None when the text ends inside brackets or a
    continued line (where tokenize fails too), _UNUSUAL when tokenize should decide."""
    tokens: list[Token] = []
    append = tokens.append
    previous_kind = None
    line, line_start, depth, continued = 1, 0, 0, False
    keywords = _PYTHON_KEYWORDS
    for match in _SCAN.finditer(text):
        group = match.lastgroup
        if group == "name":
            start = match.start(group)
            value = match.group(group)
            column = start - line_start + 1
            if tokens:
                previous = tokens[-1]
                if previous.text == "@" and previous.kind == NAME and previous.line == line and \
                        previous.column + 1 == column:
                    tokens[-1] = Token("@" + value, NAME, line, previous.column)  # a decorator
                    continued = False
                    continue
                if value == "from" and previous.text == "yield" and previous.line == line:
                    tokens[-1] = Token("yield from", KEYWORD, line, previous.column)
                    continued = False
                    continue
            kind = KEYWORD if value in keywords else NAME
            append(Token(value, kind, line, column))
            previous_kind = kind
        elif group == "operator":
            start = match.start(group)
            value = match.group(group)
            column = start - line_start + 1
            if len(value) == 1:
                append(Token(value, OPERATOR, line, column))
                if value in _OPENING:
                    depth += 1
                elif value in _CLOSING:
                    depth -= 1
            else:
                for part in _PYGMENTS_OPERATOR.finditer(value):
                    piece = part.group(0)
                    append(Token(piece, OPERATOR, line, column + part.start()))
                    if piece in _OPENING:
                        depth += 1
                    elif piece in _CLOSING:
                        depth -= 1
            previous_kind = OPERATOR
        elif group == "newline" or group == "continuation":
            line += 1
            line_start = match.end()
            continued = group == "continuation"
            continue
        elif group == "string":
            start = match.start(group)
            value = match.group(group)
            previous_kind = _add_python_string(tokens, previous_kind, value, line, start - line_start + 1,
                                               text[line_start:start], keep_comments, raw)
            newlines = value.count("\n")
            if newlines:
                line += newlines
                line_start = start + value.rfind("\n") + 1
        elif group == "number":
            start = match.start(group)
            value = match.group(group)
            append(Token(value if raw else NUMBER_TOKEN, NUMBER, line, start - line_start + 1))
            previous_kind = NUMBER
        elif group == "comment":
            if keep_comments or raw:
                start = match.start(group)
                append(Token(match.group(group).strip() if raw else "<comment>", COMMENT, line,
                             start - line_start + 1))
            previous_kind = COMMENT
        elif group == "at":
            start = match.start(group)
            # At the start of a line, a decorator begins (as pygments reads it); else the matrix operator.
            kind = OPERATOR if text[line_start:start].strip() else NAME
            append(Token("@", kind, line, start - line_start + 1))
            previous_kind = kind
        elif group == "end":
            break
        else:
            return _UNUSUAL
        continued = False
    if depth > 0 or continued:
        return None
    return tokens


def _add_python_string(tokens: list[Token], previous_kind: str | None, value: str, line: int, column: int,
                       before: str, keep_comments: bool, raw: bool) -> str | None:
    """A whole Python string literal as pygments reads it; `before` is its line's text before it.
    Returns the kind of the last token added."""
    if _is_docstring(value, before, len(before)):
        # pygments reads a triple-quoted string that starts a line as documentation,
        # and its prefix letters (r, b, u) as a string of their own.
        prefix = value[: len(value) - len(value.lstrip("rRuUbB"))]
        if prefix:
            add_string(tokens, previous_kind, prefix, line, column, raw)
        if keep_comments or raw:
            tokens.append(Token(value if raw else "<comment>", COMMENT, line, column))
        return COMMENT
    if "f" in value[: value.find(value[-1])].lower():
        # An f-string: its fields hold names (and code) that count as uses.
        for inner in lex_with_pygments(value, "python", False, raw):
            inner_line = line + inner.line - 1
            inner_column = column + inner.column - 1 if inner.line == 1 else inner.column
            if inner.kind == STRING:
                previous_kind = add_string(tokens, previous_kind, inner.text, inner_line, inner_column, raw)
            else:
                tokens.append(Token(inner.text, inner.kind, inner_line, inner_column))
                previous_kind = inner.kind
        return previous_kind
    return add_string(tokens, previous_kind, value, line, column, raw)


def _tokenize_python(text: str, keep_comments: bool, raw: bool) -> list[Token] | None:
    """Python through tokenize; None when tokenize cannot read the text (then pygments does)."""
    try:
        stream = list(tokenize.generate_tokens(io.StringIO(text).readline))
    except (tokenize.TokenError, SyntaxError):
        return None
    tokens: list[Token] = []
    previous_kind = None
    for kind_code, value, (line, offset), _, line_text in stream:
        column = offset + 1
        if kind_code in _SKIPPED:
            continue
        if kind_code == tokenize.COMMENT:
            if keep_comments or raw:
                tokens.append(Token(value.strip() if raw else "<comment>", COMMENT, line, column))
            previous_kind = COMMENT
        elif kind_code == tokenize.STRING:
            previous_kind = _add_python_string(tokens, previous_kind, value, line, column, line_text[:offset],
                                               keep_comments, raw)
        elif kind_code in _STRING_PARTS:  # the pieces of an f-string, from Python 3.12 on
            previous_kind = add_string(tokens, previous_kind, value, line, column, raw)
        elif kind_code == tokenize.NUMBER:
            tokens.append(Token(value if raw else NUMBER_TOKEN, NUMBER, line, column))
            previous_kind = NUMBER
        elif kind_code == tokenize.NAME:
            previous = tokens[-1] if tokens else None
            if previous is not None and previous.line == line and previous.kind == NAME and \
                    previous.text == "@" and \
                    previous.column + len(previous.text) == column:
                tokens[-1] = Token(previous.text + value, NAME, previous.line, previous.column)  # a decorator
                continue
            if value == "from" and previous is not None and previous.text == "yield" and previous.line == line:
                tokens[-1] = Token("yield from", KEYWORD, previous.line, previous.column)
                continue
            kind = KEYWORD if value in _PYTHON_KEYWORDS else NAME
            tokens.append(Token(value, kind, line, column))
            previous_kind = kind
        elif kind_code == tokenize.OP and value == "@" and not line_text[:offset].strip():
            tokens.append(Token("@", NAME, line, column))  # the start of a decorator, as pygments reads it
            previous_kind = NAME
        elif kind_code == tokenize.OP:
            # Split as pygments does: only these pairs stay whole.
            for match in _PYGMENTS_OPERATOR.finditer(value):
                tokens.append(Token(match.group(0), OPERATOR, line, column + match.start()))
            previous_kind = OPERATOR
        elif value.strip():
            stripped = value.strip()
            kind = NAME if stripped.isidentifier() else OPERATOR
            tokens.append(Token(stripped, kind, line, column + len(value) - len(value.lstrip())))
            previous_kind = kind
    return tokens


