"""Java: typed declarations (`List<String> names = ...`), `var`, anonymous classes hold fields."""

from __future__ import annotations

import functools
import re

from ..tokens import NAME, Token, lex_with_pygments
from .base import TYPE_PUNCTUATION, Language, looks_like_type_end, matching_open, parameter_groups, words

NOT_BEFORE_TYPE = words("return new throw case else goto typeof await yield in of instanceof delete void "
                        "sizeof go defer")


class TypedLanguage(Language):
    """A language whose declarations put the type first: `Type name = value;`."""

    declaration_followers = frozenset({"=", ";", ":"})  # what may follow the declared name
    type_position = "before"
    loop_words = frozenset({":"})
    call_markers = frozenset({"(", "{", "<"})  # `new ArrayList<>(items)`

    type_punctuation = TYPE_PUNCTUATION  # what may stand between a type's words (`std::string *`)

    def declarations(self, tokens: list[Token], i: int) -> list[int]:
        token = tokens[i]
        following = tokens[i + 1].text if i + 1 < len(tokens) else ""
        if token.text in self.declaration_words and following and tokens[i + 1].kind == NAME:
            return [i + 1]  # `var total = ...` (some lexers read `var` as a name)
        if token.kind == NAME:
            if i and following in self.declaration_followers and \
                    looks_like_type_end(tokens, i - 1, NOT_BEFORE_TYPE, self.type_punctuation) and \
                    tokens[i - 1].text not in self.declaration_words and \
                    not (following == ":" and tokens[i - 1].text == "?"):  # `ready ? on : off`
                return [i]
            return []
        if token.text == "catch" and following == "(":
            # `catch (IOException | RuntimeException error)`: the last name before ")".
            k = i + 2
            while k < len(tokens) and tokens[k].text != ")":
                k += 1
            if k < len(tokens) and tokens[k - 1].kind == NAME and k - 1 > i + 2:
                return [k - 1]
        return []

    def is_type_body(self, tokens: list[Token], header: range, brace: int) -> bool:
        if super().is_type_body(tokens, header, brace):
            return True
        # An anonymous class, `new Runnable() {`: its body holds fields and methods.
        if brace and tokens[brace - 1].text == ")":
            opening = matching_open(tokens, brace - 1)
            k = opening - 1
            while k > 0 and (tokens[k].kind == NAME or tokens[k].text in (".", "<", ">", ",")):
                k -= 1
            return k >= 0 and k < opening - 1 and tokens[k].text == "new"
        return False

    def is_public_function(self, tokens: list[Token], header: range) -> bool:
        return any(tokens[k].text in ("public", "protected") for k in header)


class Java(TypedLanguage):
    name = "java"
    pygments_alias = "java"
    pygments_names = ("Java",)
    reserved = words("""abstract assert boolean break byte case catch char class const continue default do
        double else enum extends final finally float for goto if implements import instanceof int interface
        long native new package private protected public return short static strictfp super switch
        synchronized this throw throws transient try void volatile while var record yield true false null""")
    binding_before = (re.compile(r"\b(var|final)\s+$"),)
    declaration_words = frozenset({"var"})
    # `synchronized (lock) {` and `try (var in = open()) {` are no methods; a resource lives in its try.
    control_words = TypedLanguage.control_words | {"synchronized", "try"}
    scoped_headers = TypedLanguage.scoped_headers | {"try"}

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        return lex_with_pygments(text, self.pygments_alias, keep_comments, raw, lexer=_java_code_lexer())

    def parameters(self, tokens: list[Token], opening: int, closing: int) -> list[int]:
        # A lambda's parameters may come without types: `(left, right) -> {`.
        if closing + 2 < len(tokens) and tokens[closing + 1].text == "-" and tokens[closing + 2].text == ">":
            groups = parameter_groups(tokens, opening, closing)
            if all(len(group) == 1 and tokens[group[0]].kind == NAME for group in groups):
                return [group[0] for group in groups]
        return super().parameters(tokens, opening, closing)


# Words that pygments reads as keywords everywhere but that Java reserves only inside module-info.java
# (`module`, `requires`, `to`, `with`...) or in one position (`sealed`, `permits`): in code they are names.
_CONTEXTUAL = frozenset({"exports", "module", "open", "opens", "permits", "provides", "requires", "sealed",
                         "non-sealed", "to", "transitive", "uses", "with"})


@functools.lru_cache(maxsize=1)
def _java_code_lexer():
    """pygments' Java lexer, but `module` opens a module declaration only as one, and contextual words
    are names: `for (Path module : paths)` otherwise swallowed the brackets that followed."""
    from pygments.lexers.jvm import JavaLexer
    from pygments.token import Keyword

    root = []
    for rule in JavaLexer.tokens["root"]:
        pattern = rule[0]
        if pattern == r"(module)\b":
            rule = (r"(module)\b(?=\s+[\w.]+\s*\{)",) + rule[1:]
        elif isinstance(pattern, str) and rule[1] is Keyword.Declaration and "|transitive|" in pattern:
            kept = [w for w in pattern[1:pattern.index(")")].split("|") if w not in _CONTEXTUAL]
            rule = ("(" + "|".join(kept) + r")\b",) + rule[1:]
        root.append(rule)
    code_lexer = type("JavaCodeLexer", (JavaLexer,), {"tokens": {**JavaLexer.tokens, "root": root}})
    return code_lexer(stripnl=False, ensurenl=False)


JAVA = Java()
