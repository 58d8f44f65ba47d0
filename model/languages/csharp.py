"""C#: typed declarations and `var`, named arguments, object initializers."""

from __future__ import annotations

from ..tokens import Token
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
    type_punctuation = TypedLanguage.type_punctuation | {"?"}  # `int? limit = null;`

    def occurrence_role(self, tokens: list[Token], j: int, opening: int) -> str:
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


CSHARP = CSharp()
