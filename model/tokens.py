"""Source text to normalised tokens: literals abstracted, comments dropped, names split."""

from __future__ import annotations

import functools
import io
import keyword
import re
import tokenize
from typing import NamedTuple

from pygments.lexers import get_lexer_for_filename
from pygments.token import Comment, Error, Keyword, Literal, Name, Number, Operator, Punctuation, String, Text
from pygments.util import ClassNotFound

# pygments lexer name -> our language id; anything else is not learned from.
LANGUAGES = {
    "Python": "python",
    "JavaScript": "javascript",
    "JSX": "javascript",
    "TypeScript": "typescript",
    "TSX": "typescript",
    "Go": "go",
    "Java": "java",
    "Rust": "rust",
    "C": "c",
    "C++": "cpp",
    "C#": "csharp",
}

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


@functools.lru_cache(maxsize=256)
def language_for_path(path: str) -> str | None:
    """Language id from a file name alone (never from its content), or None when unsupported."""
    try:
        lexer = get_lexer_for_filename(path)
    except ClassNotFound:
        return None
    return LANGUAGES.get(lexer.name)


@functools.lru_cache(maxsize=32)
def _lexer(language: str):
    from pygments.lexers import get_lexer_by_name

    # stripnl=False keeps line numbers aligned with the file (and with ast).
    return get_lexer_by_name(language, stripnl=False, ensurenl=False)


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


def lex(text: str, language: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
    """Lex source text into normalised tokens.

    String fragments merge into one STRING_TOKEN, numbers become NUMBER_TOKEN, comments
    are dropped unless asked for (then their text is replaced by the kind, never kept).
    With raw=True (for vocabulary statistics only) literals and comments keep their text.
    Python goes through the standard library's tokenize (about four times faster than
    pygments, same tokens), falling back to pygments where tokenize gives up.
    """
    if language == "python":
        fast = lex_python(text, keep_comments, raw)
        if fast is not None:
            return fast
    return lex_with_pygments(text, language, keep_comments, raw)


def lex_with_pygments(text: str, language: str, keep_comments: bool, raw: bool) -> list[Token]:
    tokens: list[Token] = []
    line, column = 1, 1
    previous_kind = None
    for _, ttype, value in _lexer(language).get_tokens_unprocessed(text):
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
            previous_kind = _add_string(tokens, previous_kind, value, start_line, start_column, raw)
            continue
        if kind == NUMBER:
            tokens.append(Token(stripped if raw else NUMBER_TOKEN, NUMBER, start_line, start_column))
        elif kind == OPERATOR and len(stripped) > 1 and not _is_operator(stripped):
            # Punctuation runs such as "):" arrive as one value in some lexers: split them.
            offset = value.index(stripped[0])
            for i, char in enumerate(stripped):
                if not char.isspace():
                    tokens.append(Token(char, OPERATOR, start_line, start_column + offset + i))
        else:
            if kind == NAME and not stripped.replace("$", "_").isidentifier():
                kind = OPERATOR if not any(c.isalnum() for c in stripped) else NAME
            leading = len(value) - len(value.lstrip())
            tokens.append(Token(stripped, kind, start_line, start_column + leading))
        previous_kind = kind
    return tokens


def _add_string(tokens: list[Token], previous_kind: str | None, value: str, line: int, column: int,
                raw: bool) -> str:
    """Adjacent string fragments become one string token (its text kept only when raw)."""
    if previous_kind != STRING:
        tokens.append(Token(value if raw else STRING_TOKEN, STRING, line, column))
    elif raw:
        merged = tokens[-1]
        tokens[-1] = Token(merged.text + value, STRING, merged.line, merged.column)
    return STRING


_PYTHON_KEYWORDS = frozenset(keyword.kwlist)
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
            _add_string(tokens, previous_kind, prefix, line, column, raw)
        if keep_comments or raw:
            tokens.append(Token(value if raw else "<comment>", COMMENT, line, column))
        return COMMENT
    if "f" in value[: value.find(value[-1])].lower():
        # An f-string: its fields hold names (and code) that count as uses.
        for inner in lex_with_pygments(value, "python", False, raw):
            inner_line = line + inner.line - 1
            inner_column = column + inner.column - 1 if inner.line == 1 else inner.column
            if inner.kind == STRING:
                previous_kind = _add_string(tokens, previous_kind, inner.text, inner_line, inner_column, raw)
            else:
                tokens.append(Token(inner.text, inner.kind, inner_line, inner_column))
                previous_kind = inner.kind
        return previous_kind
    return _add_string(tokens, previous_kind, value, line, column, raw)


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
            previous_kind = _add_string(tokens, previous_kind, value, line, column, raw)
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
    """True when an identifier can be written in the given dominant style."""
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
