"""JavaScript and TypeScript: let/const/var, destructuring, object shorthand, camelCase."""

from __future__ import annotations

import re

from ..tokens import KEYWORD, NAME, OPERATOR, Token
from .base import (KEY, SHORTHAND, USE, Language, directly_inside, matching_close,
                   parameter_groups, words)

_RESERVED = words("""break case catch class const continue debugger default delete do else export
    extends finally for function if import in instanceof new return super switch this throw try typeof var
    void while with yield let static enum await implements package protected interface private public
    null true false undefined NaN Infinity arguments eval""")
# `Map<K, List<V>>`: the lexer reads two or three closing angle brackets as one token.
_ANGLE_CLOSERS = {">": 1, ">>": 2, ">>>": 3}
_FORMERLY_RESERVED = words("boolean byte char double final float goto int long native short synchronized throws "
                           "transient volatile")
# Before a "{", these make it an object literal or a destructuring pattern rather than a block.
_OBJECT_BEFORE = frozenset({"(", "=", ",", "[", "?", "return", "||", "&&", "??", "let", "const", "var", "of",
                            "in", "yield", "...", "!", "await", "typeof", "export", "default"})
# Before a "{", these make it an object type (TypeScript): `x: {`, `A | {`, `Array<{`.
_TYPE_BEFORE = frozenset({":", "|", "&", "<", "as", "satisfies"})
_DECLARATOR_END = frozenset({";", "in", "of"})
_PARAMETER_PROPERTY = frozenset({"public", "private", "protected", "readonly", "override"})


class JavaScript(Language):
    name = "javascript"
    pygments_alias = "javascript"
    pygments_names = ("JavaScript", "JSX")
    reserved = _RESERVED
    generated_suffixes = (".min.js", ".bundle.js")
    defining_words = frozenset({"function"})
    binding_before = (re.compile(r"\b(let|const|var)\s+$"), re.compile(r"\bfunction\s*\w*\s*\(([^)]*,)?\s*$"))
    declaration_words = frozenset({"let", "const", "var"})
    loop_words = frozenset({"of", "in"})
    key_loop_words = frozenset({"in"})

    member_access = frozenset({".", "?."})

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        tokens = split_dotted_names(super().lex(text, keep_comments, raw))
        # Words reserved only by old editions of the language (`final`, `native`) are names today.
        return [Token(t.text, NAME, t.line, t.column) if t.kind == KEYWORD and t.text in _FORMERLY_RESERVED else t
                for t in tokens]

    def declarations(self, tokens: list[Token], i: int) -> list[int]:
        token = tokens[i]
        if token.kind != KEYWORD:
            return []
        if token.text in self.declaration_words:
            return declarators(tokens, i + 1)
        if token.text == "catch" and i + 2 < len(tokens) and tokens[i + 1].text == "(":
            return binding_names(tokens, i + 2)
        return []

    def parameter_list(self, tokens: list[Token], brace: int) -> tuple[int, int] | None:
        """`(a, b) {`, `(a) => {`, and with a return type, `(a): Promise<T> {` or `(a): { ok: true } => {`."""
        j = brace - 1
        if j < 0 or tokens[j].text in (":", "|", "&"):
            return None  # the brace opens an object type, `(): { ok: boolean }`, not a body
        if tokens[j].text == "=>":
            j -= 1
        if tokens[j].text != ")":
            depth = 0
            while j > 0:  # back over the return type to the ")" before its ":"
                text = tokens[j].text
                if text in (")", "]", "}") or text in _ANGLE_CLOSERS:
                    depth += _ANGLE_CLOSERS.get(text, 1)
                elif text in ("(", "[", "{", "<"):
                    depth -= 1
                    if depth < 0:
                        return None
                elif depth == 0 and tokens[j].kind == OPERATOR and text not in (".", "|", "&", ":"):
                    return None  # not a type: `=> a ? { b } : c || {}` is a body without braces
                elif depth == 0 and text == ":" and tokens[j - 1].text == ")":
                    j -= 1
                    break
                j -= 1
            else:
                return None
        return self.list_closed_at(tokens, j)

    def parameters(self, tokens: list[Token], opening: int, closing: int) -> list[int]:
        found = []
        for group in parameter_groups(tokens, opening, closing):
            if tokens[group[0]].text in _PARAMETER_PROPERTY:
                continue  # `constructor(private port: number)` declares a field: its name is not free
            first = group[1] if tokens[group[0]].text == "..." and len(group) > 1 else group[0]
            if tokens[first].text != "this":
                found.extend(binding_names(tokens, first))
        return found

    def occurrence_role(self, tokens: list[Token], j: int, opening: int) -> str:
        following = tokens[j + 1].text if j + 1 < len(tokens) else ""
        # The cheap tests first: directly_inside walks back to the opening brace.
        if opening > 0 and j and following in (":", "?", "(") and directly_inside(tokens, opening, j):
            before = tokens[j - 1].text
            if before in ("{", ",", ";") and following in (":", "?") and tokens[opening - 1].text in _TYPE_BEFORE:
                return KEY  # a member of an object type, `{ result: T; ctx?: Context }`
            if following == "(" and (before in ("{", ",") or before in ("get", "set", "async", "*") and
                                      tokens[j - 2].text in ("{", ",")) and is_object_brace(tokens, opening):
                return KEY  # a method of an object literal, `{ get defaultValue() {...} }`
        if opening < 0 or not j or tokens[j - 1].text not in ("{", ","):
            return USE
        if following not in (":", ",", "}", "=") or not is_object_brace(tokens, opening):
            return USE
        if tokens[j - 1].text == "," and not directly_inside(tokens, opening, j):
            return USE
        return KEY if following == ":" else SHORTHAND

    def is_public_function(self, tokens: list[Token], header: range) -> bool:
        return any(tokens[k].text == "export" for k in header)


class TypeScript(JavaScript):
    name = "typescript"
    pygments_alias = "typescript"
    pygments_names = ("TypeScript", "TSX")
    reserved = _RESERVED | words("any boolean number string symbol never unknown object type namespace declare "
                                 "readonly keyof as is")
    generated_suffixes = (".generated.ts", ".d.ts")
    type_position = "colon"

    def not_uses(self, tokens: list[Token]) -> frozenset[int]:
        # A type annotation names types, never variables: `(number: number)`, `(checks: checks.Check[])`.
        return frozenset(type_positions(tokens))


def type_positions(tokens: list[Token]) -> set[int]:
    """Indices of the names in type annotations: of parameters and declarations (`name: Type`), of
    return types (`): Type {` or `): Type =>`) and after `as`; a name after `typeof` is a value and stays out."""
    found: set[int] = set()
    brackets: list[int] = []  # indices of the open brackets around each token
    for k, token in enumerate(tokens):
        text = token.text
        if text in ("(", "[", "{"):
            brackets.append(k)
        elif text in (")", "]", "}"):
            if brackets:
                brackets.pop()
        elif text in ("as", "satisfies") and token.kind == KEYWORD:
            found.update(_type_span(tokens, k + 1)[0])  # `bag as { minimum?: number }`
        elif text == ":" and k > 1:
            returns = tokens[k - 1].text == ")"
            name = k - 2 if tokens[k - 1].text == "?" else k - 1
            before = tokens[name - 1].text if name else ""
            annotated = tokens[name].kind == NAME and (
                before in ("const", "let", "var") or
                brackets and tokens[brackets[-1]].text == "(" and (before in ("(", ",", "...") or
                                                                   before in _PARAMETER_PROPERTY))
            if returns or annotated:
                names, end = _type_span(tokens, k + 1)
                if annotated or end < len(tokens) and tokens[end].text in ("{", "=>"):
                    found.update(names)
    return found


def _type_span(tokens: list[Token], start: int) -> tuple[list[int], int]:
    """The names of the type that starts at `start`, and the index of the token that ends it."""
    names, depth = [], 0
    for k in range(start, len(tokens)):
        token = tokens[k]
        text = token.text
        if text in ("(", "[", "{", "<"):
            if depth == 0 and text == "{" and k > start and tokens[k - 1].text not in ("|", "&", "<", ",", "(", ":"):
                return names, k  # the body after a return type
            depth += 1
        elif text in (")", "]", "}") or text in _ANGLE_CLOSERS:
            if depth == 0:
                return names, k
            depth = max(0, depth - _ANGLE_CLOSERS.get(text, 1))
        elif depth == 0 and text in (",", "=", ";", "=>"):
            return names, k
        elif token.kind == NAME and tokens[k - 1].text not in ("typeof", "asserts") and \
                (k + 1 >= len(tokens) or tokens[k + 1].text != "is"):
            names.append(k)  # `typeof limit`, `asserts value` and `value is T` name parameters, not types
    return names, len(tokens)


def declarators(tokens: list[Token], k: int) -> list[int]:
    """Names bound by `a = 1, {b, c: d} = e, [f] = g`, starting at the first declarator."""
    found: list[int] = []
    while k < len(tokens):
        found.extend(binding_names(tokens, k))
        k = _next_declarator(tokens, k)
        if k < 0:
            break
    return found


def binding_names(tokens: list[Token], k: int) -> list[int]:
    """The names one binding target binds: a name, or every name in an object or array pattern."""
    token = tokens[k]
    if token.kind == NAME:
        return [k]
    if token.text not in ("{", "["):
        return []
    closing = matching_close(tokens, k)
    found: list[int] = []
    for item in parameter_groups(tokens, k, closing):
        texts = [tokens[m].text for m in item]
        if texts[0] == "...":
            if len(item) > 1:
                found.extend(binding_names(tokens, item[1]))
            continue
        if token.text == "{":
            colon = _top_level(tokens, item, ":")
            target = item[colon + 1] if colon is not None and colon + 1 < len(item) else item[0]
            if colon is None and tokens[item[0]].kind != NAME:
                continue
            found.extend(binding_names(tokens, target))
        else:
            found.extend(binding_names(tokens, item[0]))
    return found


def _top_level(tokens: list[Token], item: list[int], text: str) -> int | None:
    depth = 0
    for position, k in enumerate(item):
        t = tokens[k].text
        if t in ("(", "[", "{"):
            depth += 1
        elif t in (")", "]", "}"):
            depth -= 1
        elif t == text and depth == 0:
            return position
    return None


def _next_declarator(tokens: list[Token], first: int) -> int:
    """Index after the top-level comma that ends the declarator at `first`, or -1 at the statement's end."""
    depth = 0
    annotation = False  # inside `: Record<string, Item>` between the name and its "="
    for j in range(first, len(tokens)):
        text = tokens[j].text
        if depth == 0 and j > first and text == ":" and not annotation:
            annotation = True
        elif annotation and depth == 0 and text == "=":
            annotation = False
        if annotation and text == "<":
            depth += 1
        elif annotation and text in _ANGLE_CLOSERS:
            depth -= _ANGLE_CLOSERS[text]
        elif text in ("(", "[", "{"):
            depth += 1
        elif text in (")", "]", "}"):
            depth -= 1
            if depth < 0:
                return -1
        elif depth == 0 and text in _DECLARATOR_END:
            return -1
        elif depth == 0 and j > first and tokens[j].line != tokens[j - 1].line and \
                tokens[j - 1].text not in (",", "=") and tokens[j - 1].kind != OPERATOR:
            return -1  # a new line without a continuing operator: the statement ended
        elif depth == 0 and text == ",":
            return j + 1 if j + 1 < len(tokens) else -1
    return -1


def is_object_brace(tokens: list[Token], opening: int) -> bool:
    """Whether a "{" opens an object literal or destructuring pattern rather than a block."""
    if opening <= 0:
        return False
    before = tokens[opening - 1].text
    if before == ":":
        # `key: {` in an object, but `case X: {` and `default: {` open blocks.
        return not (opening >= 3 and tokens[opening - 3].text == "case") and tokens[opening - 2].text != "default"
    return before in _OBJECT_BEFORE


def split_dotted_names(tokens: list[Token]) -> list[Token]:
    """`payload.value` as three tokens: after `key:` pygments' TypeScript lexer reads a dotted path as one
    name (a type), where in `{ value: payload.value, async: params?.async }` it is a variable and a member."""
    split: list[Token] = []
    for token in tokens:
        if token.kind != NAME or "." not in token.text or not _DOTTED.fullmatch(token.text):
            split.append(token)
            continue
        column = token.column
        for part in _MEMBER_ACCESS.split(token.text):
            split.append(Token(part, NAME if part[0] not in "?." else OPERATOR, token.line, column))
            column += len(part)
    return split


_DOTTED = re.compile(r"[A-Za-z_$][\w$]*(?:\??\.[A-Za-z_$][\w$]*)+")
_MEMBER_ACCESS = re.compile(r"(\?\.|\.)")


JAVASCRIPT = JavaScript()
TYPESCRIPT = TypeScript()
