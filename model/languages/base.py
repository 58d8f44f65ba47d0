"""What every language module answers: the shared machinery asks these, never a language's name."""

from __future__ import annotations

import re

from ..tokens import KEYWORD, NAME, Token, lex_with_pygments

# How an occurrence of a variable's name is used (see `Language.occurrence_role`).
USE = "use"
KEY = "key"  # a property or field label that merely looks like the variable (`{timeout: 5}`)
SHORTHAND = "shorthand"  # both at once (`{timeout}`): a rename writes `timeout: new`

_TYPE_BLOCK_WORDS = frozenset({"class", "interface", "struct", "enum", "namespace", "impl", "trait",
                               "mod", "record", "union", "module", "type", "extern"})


class Language:
    """A language as cognomen reads it. Subclasses override what differs; one module per family."""

    name = ""
    pygments_alias = ""  # the pygments lexer that reads it
    pygments_names: tuple[str, ...] = ()  # pygments lexer names that map to this language
    reserved: frozenset[str] = frozenset()  # keywords and builtins: never a suggested name
    receivers: frozenset[str] = frozenset({"this"})  # not chosen freely; never judged
    keyword_arguments = False  # whether callers may pass an argument by its parameter's name
    naming_style = "camel"  # for locals, when the team's own style cannot be learned
    comment_prefix = "//"
    generated_suffixes: tuple[str, ...] = ()  # file names that mark generated code
    defining_words: frozenset[str] = frozenset()  # keywords right before a function's name
    binding_before: tuple[re.Pattern, ...] = ()  # text before the cursor where a new variable is named
    member_access = frozenset({"."})  # tokens after which a name is a member, not a variable
    declaration_words: frozenset[str] = frozenset()  # `let`, `var`: the next name is declared
    declaration_operators: frozenset[str] = frozenset()  # operators that may start a declaration (`|x|`)
    # Name flow (token_flow.py): what binds a value, what introduces a loop's collection, where a
    # declared type is written ("before" the name, "after" it, after a "colon", or "" for none).
    assignment_operators = frozenset({"="})
    loop_words: frozenset[str] = frozenset()
    key_loop_words: frozenset[str] = frozenset()  # loops over a mapping's keys (`for (k in obj)`)
    adding_methods = frozenset({"push", "add", "append", "put", "insert", "push_back", "Add", "offer"})
    type_position = ""
    call_markers = frozenset({"(", "{"})  # after a name, what makes it a call (or a constructed literal)
    # Methods that hand on the value they are called on (Rust's `.unwrap()`): `first().unwrap()` is a `first`.
    passing_methods: frozenset[str] = frozenset()
    collection_types = frozenset({"List", "ArrayList", "LinkedList", "Set", "HashSet", "Collection", "Iterable",
                                  "Vec", "VecDeque", "Array", "ReadonlyArray", "IEnumerable", "IList", "ICollection",
                                  "vector", "Sequence", "Stream", "Iterator", "Slice"})
    # A block whose header starts with one of these owns the names its header declares.
    scoped_headers = frozenset({"for", "foreach", "catch", "while", "using", "switch", "|"})
    # Before a parenthesised list that a block follows, these make it a condition, never parameters.
    control_words = frozenset({"if", "while", "for", "switch", "catch", "foreach", "using", "lock", "match"})

    def lex(self, text: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
        """Normalised tokens (see `tokens.lex_with_pygments`)."""
        return lex_with_pygments(text, self.pygments_alias, keep_comments, raw)

    def read(self, text: str, tokens: list[Token]) -> tuple[list, dict]:
        """Function-local variables and parameters, from the token stream, and the file's facts."""
        from ..scopes import token_variables

        return token_variables(tokens, self), {}

    # --- hooks of the token-based scope finder (`scopes.token_variables`) ------------------

    def declarations(self, tokens: list[Token], i: int) -> list[int]:
        """Token indices of the names that a declaration starting at token i binds ([] for none)."""
        if tokens[i].text in self.declaration_words and i + 1 < len(tokens) and tokens[i + 1].kind == NAME:
            return [i + 1]
        return []

    def parameters_before(self, tokens: list[Token], brace: int) -> list[int]:
        """Token indices of the parameter names of the function whose body opens at `brace`."""
        found = self.parameter_list(tokens, brace)
        return self.parameters(tokens, *found) if found else []

    def results_before(self, tokens: list[Token], brace: int) -> list[int]:
        """Token indices of the named results of that function (Go's `(n int, err error)`)."""
        return []

    def parameter_list(self, tokens: list[Token], brace: int) -> tuple[int, int] | None:
        """The parenthesised list a block follows: (index of "(", index of ")"), or None."""
        j = brace - 1
        # Skip a return type or throws clause: walk back to the nearest ")" on the header.
        while j >= 0 and tokens[j].text != ")" and tokens[j].text not in (";", "{", "}", "=", "("):
            j -= 1
        if j < 0 or tokens[j].text != ")":
            return None
        return self.list_closed_at(tokens, j)

    def list_closed_at(self, tokens: list[Token], closing: int) -> tuple[int, int] | None:
        """(index of "(", `closing`) for the list a ")" closes, unless a control word leads it (`if (...) {`)."""
        opening = matching_open(tokens, closing)
        if opening <= 0 or tokens[opening - 1].text in self.control_words:
            return None
        return opening, closing

    def parameters(self, tokens: list[Token], opening: int, closing: int) -> list[int]:
        """Parameter names in a list; typed languages: the last name before any default value."""
        found = []
        for group in parameter_groups(tokens, opening, closing):
            texts = [tokens[k].text for k in group]
            head = group[:texts.index("=")] if "=" in texts else group
            names = [k for k in head if tokens[k].kind == NAME]
            if len(head) >= 2 and names and names[-1] == head[-1] and not _is_member(self, tokens, head):
                found.append(head[-1])
        return found

    def is_type_body(self, tokens: list[Token], header: range, brace: int) -> bool:
        """Whether the block opening at `brace` holds members (class, struct...) rather than statements."""
        words = {tokens[k].text for k in header}
        if words & _TYPE_BLOCK_WORDS and "(" not in words:
            return True
        # `class Foo extends Bar(...) {` and the like, but not a function or lambda that mentions a type word.
        before = tokens[brace - 1].text if brace else ""
        return bool(words & {"class", "interface", "struct", "enum"}) and "=>" not in words \
            and "function" not in words and before != ")"

    def block_header(self, tokens: list[Token], brace: int) -> range:
        """The tokens of a block's header: back to the previous statement boundary or unclosed bracket."""
        return header_range(tokens, brace, (";", "{", "}"))

    def not_uses(self, tokens: list[Token]) -> frozenset[int]:
        """Token indices that never bind or use a variable, whatever their text (a type annotation's names)."""
        return frozenset()

    def visible_from(self, tokens: list[Token], index: int, body: int) -> int:
        """Token index from which the name bound at `index` refers to it; `body` is its block's "{".

        Before that (a declaration's own initializer in Go or Rust, a parameter's type) the name
        still means whatever it meant outside. Here: at once.
        """
        return index

    def occurrence_role(self, tokens: list[Token], j: int, opening: int) -> str:
        """USE, KEY or SHORTHAND for the name at j; `opening` is the innermost "{" around it (or -1)."""
        return USE

    def shorthand_rename(self, old: str, new: str) -> str:
        """What a shorthand occurrence (`{timeout}`) becomes when the variable is renamed."""
        return f"{old}: {new}"

    def is_public_function(self, tokens: list[Token], header: range) -> bool:
        """Whether a function whose header spans these tokens can be called from other modules."""
        return False

    def function_name(self, tokens: list[Token], brace: int) -> str:
        """The name of the function whose body opens at `brace` ("" for a lambda or a block)."""
        found = self.parameter_list(tokens, brace)
        if found is None or found[0] == 0 or tokens[found[0] - 1].kind != NAME:
            return ""
        return tokens[found[0] - 1].text

    def dictated_by(self, tokens: list[Token], header: range, enclosing: range) -> str:
        """Why a function's parameter names are not its own to choose (it overrides a base's), or ""."""
        texts = {tokens[k].text for k in header}
        if "override" in texts or "@Override" in texts:
            return "it overrides a base's method"
        return ""


# --- helpers the language modules share -------------------------------------------------


def _is_member(language: Language, tokens: list[Token], head: list[int]) -> bool:
    """Whether a list item ends in a member, `this.lock`, rather than a parameter (`int... amounts`)."""
    return tokens[head[-2]].text in language.member_access and \
        (len(head) < 3 or tokens[head[-3]].text not in language.member_access)


def header_range(tokens: list[Token], brace: int, boundaries: tuple[str, ...], line: int | None = None) -> range:
    """The tokens before `brace` back to a boundary outside brackets or an unclosed bracket (and,
    given a line, no further than that line)."""
    j, depth = brace - 1, 0
    while j >= 0 and (line is None or tokens[j].line == line):
        text = tokens[j].text
        if text in (")", "]"):
            depth += 1
        elif text in ("(", "["):
            if depth == 0:
                break
            depth -= 1
        elif depth == 0 and text in boundaries:
            break
        j -= 1
    return range(j + 1, brace)


def matching_open(tokens: list[Token], closing: int) -> int:
    """Index of the "(" or "[" that the bracket at `closing` closes, or -1."""
    depth = 0
    j = closing
    while j >= 0:
        text = tokens[j].text
        if text in (")", "]"):
            depth += 1
        elif text in ("(", "["):
            depth -= 1
            if depth == 0:
                return j
        j -= 1
    return -1


def matching_close(tokens: list[Token], opening: int) -> int:
    """Index of the bracket that closes the one at `opening`, or len(tokens)."""
    depth = 0
    for j in range(opening, len(tokens)):
        text = tokens[j].text
        if text in ("(", "[", "{"):
            depth += 1
        elif text in (")", "]", "}"):
            depth -= 1
            if depth == 0:
                return j
    return len(tokens)


def directly_inside(tokens: list[Token], opening: int, j: int) -> bool:
    """Whether token j sits in the braces at `opening` outside any nested bracket."""
    depth = 0
    for k in range(j - 1, opening, -1):
        text = tokens[k].text
        if text in (")", "]", "}"):
            depth += 1
        elif text in ("(", "[", "{"):
            if depth == 0:
                return False
            depth -= 1
    return True


def parameter_groups(tokens: list[Token], opening: int, closing: int) -> list[list[int]]:
    """Token indices of each comma-separated item between two brackets, nested brackets kept whole."""
    groups: list[list[int]] = [[]]
    depth = 0
    for k in range(opening + 1, closing):
        text = tokens[k].text
        if text in ("(", "[", "{", "<"):
            depth += 1
        elif text in (")", "]", "}", ">", ">>", ">>>") and depth:
            depth = max(0, depth - len(text) if text[0] == ">" else depth - 1)  # `Map<K, List<V>>`
            groups[-1].append(k)
            continue
        if text == "," and depth == 0:
            groups.append([])
        else:
            groups[-1].append(k)
    return [group for group in groups if group]


TYPE_PUNCTUATION = frozenset({"::", ".", "*", "&", "[", "]"})
_BOUNDARIES = frozenset({";", "{", "}", "(", ","})
_NOT_IN_GENERICS = frozenset({";", "{", "}", "=", "&&", "||", "return"})


def looks_like_type_end(tokens: list[Token], i: int, not_before_type: frozenset[str],
                        punctuation: frozenset[str] = TYPE_PUNCTUATION) -> bool:
    """Whether tokens up to i read as a type that starts a declaration (`final List<String>`, `int *`).

    The type must begin at a statement boundary or after a modifier: in `sum += item * scale;`
    the `*` multiplies, in `int *scale;` it is part of the type.
    """
    words_seen = 0
    j = i
    while j >= 0:
        token = tokens[j]
        if token.text == ">":
            depth = 0
            while j >= 0:  # a generic argument list, `Map<String, List<Long>>`
                depth += {">": 1, ">>": 2, "<": -1}.get(tokens[j].text, 0)
                if depth <= 0:
                    break
                if tokens[j].text in _NOT_IN_GENERICS:
                    return False  # `bits = token >> SHIFT;` shifts
                j -= 1
            j -= 1
            continue
        if token.kind == NAME:
            words_seen += 1
            if words_seen > 1 and tokens[j + 1].kind == NAME and j + 1 <= i:
                return False  # two names in a row before the declared name: not a type
        elif token.kind == KEYWORD:
            if token.text in not_before_type or token.text in ("true", "false", "null", "this", "super"):
                return False
            words_seen += 1
        elif token.text not in punctuation:
            return words_seen > 0 and token.text in _BOUNDARIES
        j -= 1
    return words_seen > 0


def words(text: str) -> frozenset[str]:
    return frozenset(text.split())
