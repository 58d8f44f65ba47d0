"""Rust: `let` and `for` patterns, closures, struct fields and shorthand, snake_case."""

from __future__ import annotations

import re

from ..tokens import KEYWORD, NAME, STRING, Token
from .base import KEY, SHORTHAND, USE, Language, directly_inside, matching_close, parameter_groups, words

# After these, a "|" opens a closure's parameters rather than being an operator.
_CLOSURE_BEFORE = frozenset({"(", ",", "=", "move", "{", ";", "return", "=>", ":"})
# Before a type's name, these make the "{" that follows a declaration or a block, never a literal.
_NOT_LITERAL_BEFORE = frozenset({"struct", "enum", "impl", "trait", "union", "for", "if", "while", "match", "in",
                                 "mod", "else", "=>"})


class Rust(Language):
    name = "rust"
    pygments_alias = "rust"
    pygments_names = ("Rust",)
    reserved = words("""as break const continue crate else enum extern false fn for if impl in let loop match
        mod move mut pub ref return self Self static struct super trait true type unsafe use where while async
        await dyn""")
    receivers = frozenset({"self"})
    naming_style = "snake"
    defining_words = frozenset({"fn"})
    binding_before = (re.compile(r"\blet\s+(mut\s+)?$"),)
    member_access = frozenset({".", "::"})
    loop_words = frozenset({"in"})
    type_position = "colon"
    call_markers = frozenset({"(", "{", "!"})  # `vec![...]`
    passing_methods = frozenset({"unwrap", "unwrap_or", "unwrap_or_default", "unwrap_or_else", "expect", "clone",
                                 "to_owned", "into", "as_ref", "as_mut", "copied", "cloned"})
    scoped_headers = frozenset({"for", "while", "if"})

    def declarations(self, tokens: list[Token], i: int) -> list[int]:
        text = tokens[i].text
        if text == "let" and tokens[i].kind == KEYWORD:
            return pattern_names(tokens, i + 1, _pattern_end(tokens, i + 1, ("=", ";", ":")))
        if text == "for" and tokens[i].kind == KEYWORD:
            return pattern_names(tokens, i + 1, _pattern_end(tokens, i + 1, ("in",)))
        return []

    def parameters_before(self, tokens: list[Token], brace: int) -> list[int]:
        """`fn name<T>(pattern: Type, ...) -> R where ... {`: the patterns' names."""
        j, depth = brace - 1, 0
        while j >= 0:
            text = tokens[j].text
            if text in (")", "]", ">"):
                depth += 1
            elif text in ("(", "[", "<"):
                depth -= 1
            elif text in ("{", "}", ";") or depth <= 0 and text in ("=", "=>"):
                return []  # a signature holds no block nor statement: `if a > b {` is no function
            elif text == "fn" and tokens[j].kind == KEYWORD:
                break
            elif depth == 0 and text == "|":
                return _closure_parameters(tokens, j)
            j -= 1
        if j < 0:
            return []
        k = j + 2  # past `fn name`
        if k < brace and tokens[k].text == "<":
            depth = 0
            while k < brace:
                depth += {"<": 1, ">": -1}.get(tokens[k].text, 0)
                k += 1
                if depth == 0:
                    break
        if k >= brace or tokens[k].text != "(":
            return []
        closing = matching_close(tokens, k)
        return [index for group in parameter_groups(tokens, k, closing)
                for index in pattern_names(tokens, group[0], _pattern_end(tokens, group[0], _PARAMETER_STOPS))]

    def function_name(self, tokens: list[Token], brace: int) -> str:
        j = brace - 1
        while j > 0 and tokens[j].text not in ("{", "}", ";"):
            if tokens[j].text == "fn" and tokens[j].kind == KEYWORD and tokens[j + 1].kind == NAME:
                return tokens[j + 1].text
            j -= 1
        return ""

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        return _with_format_names(text, _join_lifetimes(super().lex(text, keep_comments, raw)))

    def visible_from(self, tokens: list[Token], index: int, body: int) -> int:
        # A parameter, closure parameter or `for`/`if let` binding is visible in its block; a `let` after
        # its statement: in `let total = total + 1;` the second `total` is the earlier one.
        if index < body:
            return body
        start = index
        while start > body and tokens[start].text not in ("let", ";", "{", "}"):
            start -= 1
        return _pattern_end(tokens, start, (";",)) if tokens[start].text == "let" else index

    def occurrence_role(self, tokens: list[Token], j: int, opening: int) -> str:
        # `Config { timeout: t }` and `Config { timeout }` in literals and patterns.
        if opening <= 1 or not j or tokens[j - 1].text not in ("{", ",") or j + 1 >= len(tokens):
            return USE
        following = tokens[j + 1].text
        if following not in (":", ",", "}") or not _is_struct_brace(tokens, opening) or \
                not directly_inside(tokens, opening, j):
            return USE  # `Point { x: f(a, b) }`: `a` is an argument
        return KEY if following == ":" else SHORTHAND

    def is_public_function(self, tokens: list[Token], header: range) -> bool:
        return any(tokens[k].text == "pub" for k in header)

    def dictated_by(self, tokens: list[Token], header: range, enclosing: range) -> str:
        texts = [tokens[k].text for k in enclosing]
        if "impl" in texts and "for" in texts:
            return "it implements a trait's method"
        return ""


def _closure_parameters(tokens: list[Token], closing: int) -> list[int]:
    """A closure's parameters, `|a, (b, c)| {`, given its second "|"."""
    opening = closing - 1
    while opening >= 0 and tokens[opening].text != "|":
        opening -= 1
    if opening < 0 or (opening and tokens[opening - 1].text not in _CLOSURE_BEFORE):
        return []
    return [k for group in parameter_groups(tokens, opening, closing)
            for k in pattern_names(tokens, group[0], _pattern_end(tokens, group[0], _PARAMETER_STOPS))]


def pattern_names(tokens: list[Token], start: int, end: int) -> list[int]:
    """Names a pattern binds: `(a, mut b)`, `Some(ref x)`, `Point { x, y: py }`, `&v`, `name @ ..`."""
    found = []
    for k in range(start, end):
        token = tokens[k]
        if token.kind != NAME or token.text == "_" or token.text[:1].isupper() or not token.text.isidentifier():
            continue  # variants, structs and constants are capitalised; `'a` is a lifetime
        before = tokens[k - 1].text if k else ""
        after = tokens[k + 1].text if k + 1 < len(tokens) else ""
        if before == "::" or after in ("(", "{", "::", "!", "."):
            continue
        if after == ":" and before in ("{", ",") and k + 1 < end:
            continue  # a field's name in `Point { x: px }`
        found.append(k)
    return found


# A parameter's pattern ends at its type's ":", or with the parameter when it has no type (`|a, b|`).
_PARAMETER_STOPS = (":", ",", "|")


def _pattern_end(tokens: list[Token], start: int, stops: tuple[str, ...]) -> int:
    depth = 0
    for k in range(start, len(tokens)):
        text = tokens[k].text
        if text in ("(", "[", "{"):
            depth += 1
        elif text in (")", "]", "}"):
            depth -= 1
            if depth < 0:
                return k
        elif depth == 0 and text in stops:
            return k
    return len(tokens)


def _is_struct_brace(tokens: list[Token], opening: int) -> bool:
    """Whether a "{" follows a struct's name in a literal or pattern (`Point {`, `Self {`)."""
    name = tokens[opening - 1]
    if name.kind != NAME and name.text != "Self" or not name.text[:1].isupper():
        return False
    k = opening - 2
    while k > 0 and tokens[k].text == "::" and tokens[k - 1].kind == NAME:
        k -= 2
    return tokens[k].text not in _NOT_LITERAL_BEFORE


def _join_lifetimes(tokens: list[Token]) -> list[Token]:
    """`'a` as one token (pygments reads a quote and a name): a lifetime is no variable."""
    joined: list[Token] = []
    for token in tokens:
        previous = joined[-1] if joined else None
        if previous is not None and previous.text == "'" and token.kind == NAME and previous.line == token.line \
                and previous.column + 1 == token.column:
            joined[-1] = Token("'" + token.text, NAME, previous.line, previous.column)
        else:
            joined.append(token)
    return joined


# Macros whose string arguments are format strings: `{total}` there names a variable.
_FORMAT_MACROS = frozenset({"format", "print", "println", "eprint", "eprintln", "write", "writeln", "panic",
                            "format_args", "assert", "assert_eq", "assert_ne", "debug_assert", "debug_assert_eq",
                            "debug_assert_ne", "unreachable", "todo", "unimplemented", "trace", "debug", "info",
                            "warn", "error"})
_INLINE_ARGUMENT = re.compile(r"\{\{|\{([A-Za-z_][A-Za-z0-9_]*)(?=[:}])")


def _with_format_names(text: str, tokens: list[Token]) -> list[Token]:
    """Tokens with the names that format strings capture (`println!("{total}")`) added as names at their
    places, so a rename reaches them."""
    lines = text.split("\n")
    result: list[Token] = []
    depth = 0
    macro_depths: list[int] = []  # bracket depths at which a format macro's arguments are read
    for k, token in enumerate(tokens):
        result.append(token)
        if token.text in ("(", "[", "{"):
            depth += 1
            if k > 1 and tokens[k - 1].text == "!" and tokens[k - 2].text in _FORMAT_MACROS:
                macro_depths.append(depth)
        elif token.text in (")", "]", "}"):
            if macro_depths and macro_depths[-1] == depth:
                macro_depths.pop()
            depth -= 1
        elif token.kind == STRING and macro_depths and macro_depths[-1] == depth:
            result.extend(_captured_names(lines, token))
    return result


def _captured_names(lines: list[str], token: Token) -> list[Token]:
    """Names in `{name}` and `{name:>8}` of the string literal that starts at the token."""
    line, column = token.line, token.column
    text = lines[line - 1]
    start = column - 1
    quote = text.find('"', start)
    if quote < 0 or text[start:quote].strip("rb#"):
        return []
    raw = text[start:quote].startswith("r")
    found, k = [], quote + 1
    while True:
        while k < len(text):
            char = text[k]
            if char == "\\" and not raw:
                k += 2
                continue
            if char == '"':
                return found
            if char == "{":
                match = _INLINE_ARGUMENT.match(text, k)
                if match and match.group(1):
                    found.append(Token(match.group(1), NAME, line, match.start(1) + 1))
                    k = match.end()
                    continue
                if match:
                    k = match.end()
                    continue
            k += 1
        line += 1  # the literal goes on past the line's end
        if line > len(lines):
            return found
        text, k = lines[line - 1], 0


RUST = Rust()
