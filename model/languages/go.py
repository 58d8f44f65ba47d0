"""Go: `:=` and `var`, parameter groups that share a type, named results, composite-literal keys."""

from __future__ import annotations

import re

from ..tokens import KEYWORD, NAME, OPERATOR, Token
from .base import KEY, USE, Language, header_range, matching_close, parameter_groups, words

# Before a "{" on its line, these make it a block rather than a composite literal.
_CONTROL = frozenset({"if", "for", "switch", "select", "func", "else", "go", "defer"})
# After a parameter's name, the start of its type (so the list names its parameters).
_STOPS = frozenset({"{", "}", ";", ":=", "=", "if", "for", "switch", "select", "else", "return", "go", "defer",
                    "case", ","})


class Go(Language):
    name = "go"
    pygments_alias = "go"
    pygments_names = ("Go",)
    reserved = words("""break case chan const continue default defer else fallthrough for func go goto if
        import interface map package range return select struct switch type var true false nil iota append cap
        close complex copy delete imag len make new panic print println real recover string int error bool
        byte rune float64 float32 int64 int32 uint any""")
    receivers = frozenset()  # Go names its receivers in their own list, which is never read as parameters
    generated_suffixes = (".pb.go", "_generated.go")
    defining_words = frozenset({"func"})
    binding_before = (re.compile(r"^\s*$"), re.compile(r"\bvar\s+$"), re.compile(r"\bfor\s+$"))
    declaration_words = frozenset({"var"})
    assignment_operators = frozenset({"=", ":="})
    type_position = "after"
    scoped_headers = frozenset({"for", "switch", "select"})

    def declarations(self, tokens: list[Token], i: int) -> list[int]:
        token = tokens[i]
        if token.text == "var" and token.kind == KEYWORD:
            found, k = [], i + 1
            while k < len(tokens) and tokens[k].kind == NAME:
                found.append(k)
                if k + 1 < len(tokens) and tokens[k + 1].text == ",":
                    k += 2
                else:
                    break
            return [k for k in found if tokens[k].text != "_"]
        if token.kind == NAME and i + 1 < len(tokens) and tokens[i + 1].text == ":=":
            found, j = [i], i - 1
            while j > 0 and tokens[j].text == "," and tokens[j - 1].kind == NAME:
                found.append(j - 1)
                j -= 2
            return [k for k in found if tokens[k].text != "_"]  # the blank identifier binds nothing
        return []

    def visible_from(self, tokens: list[Token], index: int, body: int) -> int:
        # A parameter is visible in the body, a declared name after its declaration: in
        # `func f(url *url.URL)` and `net, err := net.Dial(...)` the second name is the package.
        if index < body:
            k = index + 1
            while k + 1 < len(tokens) and tokens[k].text == "," and tokens[k + 1].kind == NAME:
                k += 2
            if k >= len(tokens) or tokens[k].text != ":=":
                return body  # a parameter or named result
        return _statement_end(self, tokens, index)

    def parameters_before(self, tokens: list[Token], brace: int) -> list[int]:
        """A function's parameters: `a` and `b` in `func (r *T) Name(a, b int) (n int, err error) {`."""
        _, lists = self._signature(tokens, brace)
        return [index for opening, closing in lists[:1] for index in self.parameters(tokens, opening, closing)]

    def results_before(self, tokens: list[Token], brace: int) -> list[int]:
        """A function's named results, variables of its body too: `n` and `err` above."""
        _, lists = self._signature(tokens, brace)
        return [index for opening, closing in lists[1:] for index in self.parameters(tokens, opening, closing)]

    def function_name(self, tokens: list[Token], brace: int) -> str:
        return self._signature(tokens, brace)[0]

    def _signature(self, tokens: list[Token], brace: int) -> tuple[str, list[tuple[int, int]]]:
        """The function's name ("" for a literal), its parameter list, then its result list if named."""
        j, depth = brace - 1, 0
        while j >= 0:
            text = tokens[j].text
            if text in (")", "]"):
                depth += 1
            elif text in ("(", "["):
                depth -= 1
                if depth < 0:
                    return "", []
            elif depth == 0 and text == "func" and tokens[j].kind == KEYWORD:
                break
            elif depth == 0 and text in _STOPS:
                return "", []
            j -= 1
        if j < 0:
            return "", []
        k, name = j + 1, ""
        lists: list[tuple[int, int]] = []
        if k < brace and tokens[k].text == "(":
            first = (k, matching_close(tokens, k))
            k = first[1] + 1
            if k + 1 < brace and tokens[k].kind == NAME and tokens[k + 1].text in ("(", "["):
                name = tokens[k].text
                k += 1  # a method: the first list was its receiver
            else:
                lists.append(first)
        elif k < brace and tokens[k].kind == NAME:
            name = tokens[k].text
            k += 1
        if k < brace and tokens[k].text == "[":  # type parameters
            k = matching_close(tokens, k) + 1
        if k < brace and tokens[k].text == "(" and not lists:
            lists.append((k, matching_close(tokens, k)))
            k = lists[-1][1] + 1
        if k < brace and tokens[k].text == "(":  # named results are variables of the body too
            lists.append((k, matching_close(tokens, k)))
        return name, lists

    def parameters(self, tokens: list[Token], opening: int, closing: int) -> list[int]:
        # Either every parameter has a name or none has: `(a, b int)` names two, `(io.Reader, error)` none.
        groups = parameter_groups(tokens, opening, closing)
        named = any(len(g) >= 2 and tokens[g[0]].kind == NAME and tokens[g[1]].text != "." for g in groups)
        if not named:
            return []
        return [g[0] for g in groups if tokens[g[0]].kind == NAME and tokens[g[0]].text != "_"]

    def block_header(self, tokens: list[Token], brace: int) -> range:
        # Go statements end at the line's end: `for i := 0; i < n; i++ {` is one header.
        return header_range(tokens, brace, ("{", "}"), tokens[brace].line)

    def occurrence_role(self, tokens: list[Token], j: int, opening: int) -> str:
        # `Config{Timeout: timeout}`: the key is a field, the value the variable.
        if opening < 0 or not j or tokens[j - 1].text not in ("{", ",") or j + 1 >= len(tokens) \
                or tokens[j + 1].text != ":" or not _is_literal_brace(self, tokens, opening):
            return USE
        return KEY

    def is_public_function(self, tokens: list[Token], header: range) -> bool:
        # An exported function or method: its name starts with a capital letter.
        texts = [tokens[k] for k in header]
        for position, token in enumerate(texts[:-1]):
            if token.kind == NAME and texts[position + 1].text in ("(", "[") and position and (
                    texts[position - 1].text == "func" or texts[position - 1].text == ")"):
                return token.text[:1].isupper()
        return False


def _statement_end(language: Go, tokens: list[Token], start: int) -> int:
    """Index of the token that ends the simple statement at `start`: a ";", a block's "{", or a line's end."""
    depth = 0
    for k in range(start, len(tokens)):
        text = tokens[k].text
        if text in ("(", "["):
            depth += 1
        elif text == "{":
            if depth == 0 and not _is_literal_brace(language, tokens, k):
                return k
            depth += 1
        elif text in (")", "]", "}"):
            if depth == 0:
                return k
            depth -= 1
        elif depth == 0 and text == ";":
            return k
        if depth == 0 and k + 1 < len(tokens) and tokens[k + 1].line != tokens[k].line and \
                (tokens[k].kind != OPERATOR or text in (")", "]", "}", "++", "--")):
            return k + 1  # Go ends a statement at a line's end after a name, literal or closing bracket
    return len(tokens)


def _is_literal_brace(language: Go, tokens: list[Token], opening: int) -> bool:
    """Whether a "{" opens a composite literal (`T{...}`, `[]T{...}`, `map[K]V{...}`) rather than a block."""
    if opening <= 0:
        return False
    before = tokens[opening - 1]
    if before.text in ("]", "}"):
        return True
    if before.kind != NAME:
        return False
    return not any(tokens[k].text in _CONTROL for k in language.block_header(tokens, opening))


GO = Go()
