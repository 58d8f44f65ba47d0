"""C#: typed declarations and `var`, named arguments, object initializers."""

from __future__ import annotations

import bisect

from ..tokens import STRING, Token
from .base import KEY, SHORTHAND, USE, words
from .java import Java, TypedLanguage


class CSharp(TypedLanguage):
    name = "csharp"
    pygments_alias = "csharp"
    pygments_names = ("C#",)
    reserved = Java.reserved | words(
        "string object decimal bool base checked fixed internal lock out override params readonly ref sealed "
        "stackalloc unchecked unsafe using virtual event delegate operator implicit explicit")
    keyword_arguments = True  # `Send(timeout: 5)`
    declaration_words = frozenset({"var"})
    declaration_followers = frozenset({"=", ";", ":", "in"})  # `foreach (Reading reading in readings)`
    loop_words = frozenset({"in"})

    type_punctuation = TypedLanguage.type_punctuation | {"?"}  # `int? limit = null;`

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        tokens = super().lex(text, keep_comments, raw)
        if "$" not in text:
            return tokens
        starts = line_starts(text)
        found: list[Token] = []
        for token in tokens:
            found.append(token)
            if token.kind == STRING:
                found.extend(self._interpolated(text, starts[token.line - 1] + token.column - 1, starts))
        return found

    def _interpolated(self, text: str, offset: int, starts: list[int]) -> list[Token]:
        """The tokens of the expressions in an interpolated string, `$"{count:N0} of {total}"`, at their places."""
        quote = text.find('"', offset)
        prefix = text[offset:quote] if quote >= 0 else ""
        if "$" not in prefix or len(prefix) > 3 or text.startswith('"""', quote):
            return []
        verbatim = "@" in prefix
        found, k = [], quote + 1
        while k < len(text):
            char = text[k]
            if char == "\\" and not verbatim:
                k += 2
            elif char == '"' and verbatim and text.startswith('""', k):
                k += 2
            elif char == '"' or char == "\n" and not verbatim:
                break
            elif text.startswith("{{", k):
                k += 2
            elif char == "{":
                end, close = _hole_end(text, k + 1)
                for inner in self.lex(text[k + 1:end]):
                    inner_offset = k + 1 + line_starts(text[k + 1:end])[inner.line - 1] + inner.column - 1
                    line = bisect.bisect_right(starts, inner_offset)
                    found.append(Token(inner.text, inner.kind, line, inner_offset - starts[line - 1] + 1))
                k = close + 1
            else:
                k += 1
        return found

    def occurrence_role(self, tokens: list[Token], j: int, opening: int) -> str:
        # `Send(timeout: timeout)`: the argument's label is the parameter's name, not the variable.
        if j and tokens[j - 1].text in ("(", ",") and j + 1 < len(tokens) and tokens[j + 1].text == ":" and \
                (j + 2 >= len(tokens) or tokens[j + 2].text != ":"):
            return KEY
        # `new Options { Timeout = timeout }` sets a property; `new { timeout }` names one after the variable.
        if opening <= 0 or not j or tokens[j - 1].text not in ("{", ",") or j + 1 >= len(tokens):
            return USE
        following, before_brace = tokens[j + 1].text, tokens[opening - 1].text
        if following == "=" and before_brace in ("new", ")", "]") or following == "=" and \
                tokens[opening - 2].text == "new":
            return KEY
        if following in (",", "}") and before_brace == "new":
            return SHORTHAND
        return USE

    def shorthand_rename(self, old: str, new: str) -> str:
        return f"{old} = {new}"


def line_starts(text: str) -> list[int]:
    """The offset at which each line starts."""
    starts = [0]
    for line in text.split("\n")[:-1]:
        starts.append(starts[-1] + len(line) + 1)
    return starts


def _hole_end(text: str, start: int) -> tuple[int, int]:
    """Where an interpolation hole's expression ends (at its format or alignment, or its "}"), and its "}"."""
    depth, k, end = 0, start, -1
    while k < len(text):
        char = text[k]
        if char in "([{":
            depth += 1
        elif char in ")]":
            depth -= 1
        elif char == "}":
            if depth == 0:
                return (k if end < 0 else end), k
            depth -= 1
        elif char in ":," and depth == 0 and end < 0 and not text.startswith("::", k):
            end = k
        elif char in "\"'" and end < 0:
            k = text.find(char, k + 1)  # a literal inside the expression
            if k < 0:
                break
        k += 1
    return (len(text) if end < 0 else end), len(text) - 1


CSHARP = CSharp()
