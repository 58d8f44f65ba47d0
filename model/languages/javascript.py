"""JavaScript and TypeScript: let/const/var, destructuring, object shorthand, camelCase."""

from __future__ import annotations

import re

from ..tokens import KEYWORD, NAME, OPERATOR, Token
from .base import KEY, SHORTHAND, USE, Language, directly_inside, matching_close, parameter_groups, words

_RESERVED = words("""break case catch class const continue debugger default delete do else export
    extends finally for function if import in instanceof new return super switch this throw try typeof var
    void while with yield let static enum await implements package protected interface private public
    null true false undefined NaN Infinity arguments eval""")
# Before a "{", these make it an object literal or a destructuring pattern rather than a block.
_OBJECT_BEFORE = frozenset({"(", "=", ",", "[", "?", "return", "||", "&&", "??", "let", "const", "var", "of",
                            "in", "yield", "...", "!", "await", "typeof", "export", "default"})
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

    def declarations(self, tokens: list[Token], i: int) -> list[int]:
        token = tokens[i]
        if token.kind != KEYWORD:
            return []
        if token.text in self.declaration_words:
            return declarators(tokens, i + 1)
        if token.text == "catch" and i + 2 < len(tokens) and tokens[i + 1].text == "(":
            return binding_names(tokens, i + 2)
        return []

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
        if opening < 0 or not j or tokens[j - 1].text not in ("{", ","):
            return USE
        following = tokens[j + 1].text if j + 1 < len(tokens) else ""
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
    for j in range(first, len(tokens)):
        text = tokens[j].text
        if text in ("(", "[", "{"):
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


JAVASCRIPT = JavaScript()
TYPESCRIPT = TypeScript()
