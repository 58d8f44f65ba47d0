"""Name-flow cues from the token stream, for the languages read without a parser (see flow.py).

The shared reading asks each language module where a declared type sits (`type_position`),
which words introduce a loop's collection, and which methods add to a collection.
"""

from __future__ import annotations

from .tokens import KEYWORD, NAME, Token

_NOT_CALLEES = frozenset({"if", "while", "for", "switch", "catch", "return", "match", "foreach", "using", "lock",
                          "sizeof", "typeof", "function", "func", "fn", "new"})
_ITERATING_CALLS = frozenset({"iter", "into_iter", "iter_mut", "entries", "keys", "values", "items", "enumerate",
                              "chars", "lines", "stream", "toArray", "asList"})
_ENDS = frozenset({";", ")", "]", "}", ","})
RESULT = -1  # the position of a named result (Go) in `token_cues`'s parameter_positions


def token_cues(tokens: list[Token], variables, language, parameter_positions: dict[int, tuple[str, int]],
               function_of: dict[int, str]) -> None:
    """Set each variable's cues from where its occurrences sit; `parameter_positions` maps a
    parameter's declaring token to (function, position), position RESULT for a named result,
    `function_of` a token to its function's name."""
    variable_at = {i: v for v in variables for i in v.occurrences}
    for variable in variables:
        cues: list[str] = []
        first = variable.occurrences[0]
        if first in parameter_positions:
            function, position = parameter_positions[first]
            cues.append(f"returned:{function}" if position == RESULT else f"parameter:{function}#{position}")
        for word in declared_types(tokens, first, language):
            cues.append(f"type:{word}")
        for j in variable.occurrences:
            cues.extend(_occurrence_cues(tokens, j, variable, variable_at, language, function_of))
        variable.cues = tuple(dict.fromkeys(cues))


def _occurrence_cues(tokens: list[Token], j: int, variable, variable_at, language, function_of) -> list[str]:
    count = len(tokens)
    before = tokens[j - 1].text if j else ""
    after = tokens[j + 1].text if j + 1 < count else ""
    cues: list[str] = []
    if after in language.assignment_operators and before != "," and (j + 2 < count):
        cues.extend(right_hand_side(tokens, j + 2, variable, variable_at, language.call_markers,
                                    language.passing_methods))
    loop = _loop_cues(tokens, j, language, variable_at, variable) if j == variable.occurrences[0] else []
    cues.extend(loop)
    binding = j == variable.occurrences[0]  # a binding is never an argument, `if let Some(last) = ...` included
    if not loop and not binding and before in ("(", ",") and after in (")", ","):
        call = _enclosing_call(tokens, j)
        # A builtin's parameters (`len(b)`, `append(list, x)`) say nothing of what is passed.
        if call is not None and call[0] not in language.reserved:
            callee, position = call
            cues.append(f"argument:{callee}#{position}")
            opening = _call_opening(tokens, j)
            if callee in language.adding_methods and opening >= 2 and tokens[opening - 2].text == ".":
                container = tokens[opening - 3] if opening >= 3 else None
                if container is not None and container.kind == NAME:
                    cues.append(f"added_to:{container.text}")
                    holder = variable_at.get(opening - 3)
                    if holder is not None and holder is not variable:
                        holder.cues = holder.cues + (f"holds:{variable.name}",)
    if before == ":" and j >= 2 and tokens[j - 2].kind == NAME and j >= 3 and tokens[j - 3].text in ("{", ",", "(") \
            and after in _ENDS:
        cues.append(f"keyword:{tokens[j - 2].text}")  # `{timeout: limit}`, `Config{Timeout: limit}`, `send(timeout: limit)`
    if before == "=" and j >= 3 and tokens[j - 2].kind == NAME and tokens[j - 3].text == "." and after in (";", "}") \
            or before == "=" and j >= 3 and tokens[j - 2].kind == NAME and tokens[j - 3].text == "." and \
            j + 1 < count and tokens[j + 1].line != tokens[j].line:
        cues.append(f"store:{tokens[j - 2].text}")  # `this.timeout = limit`
    if before == "return" and after in (";", "}", "") or before == "return" and j + 1 < count and \
            tokens[j + 1].line != tokens[j].line:
        function = function_of.get(j)
        if function:
            cues.append(f"returned:{function}")
    return cues


def name_chain(tokens: list[Token], k: int, separators: tuple[str, ...] = (".", "::"),
               kinds: tuple[str, ...] = (NAME,)) -> list[int]:
    """The names of a chain starting at k, `self.frames.get`, as token indices."""
    chain = []
    while k < len(tokens) and tokens[k].kind in kinds and tokens[k].text not in ("mut", "const"):
        chain.append(k)
        if k + 2 < len(tokens) and tokens[k + 1].text in separators and tokens[k + 2].kind in kinds:
            k += 2
            continue
        break
    return chain


def right_hand_side(tokens: list[Token], k: int, variable, variable_at,
                    call_markers: frozenset[str] = frozenset({"(", "{"}),
                    passing: frozenset[str] = frozenset()) -> list[str]:
    """Cues of the value bound at k: `open_session(...)`, `self.frames.get(...)`, `config.timeout`, `rows[i]`."""
    count = len(tokens)
    while k < count and tokens[k].text in ("new", "await", "&", "*", "try", "mut"):
        k += 1
    chain = name_chain(tokens, k, (".", "::", "->"))
    if not chain:
        return []
    last = chain[-1]
    following = tokens[last + 1].text if last + 1 < count else ""
    cues = []
    if following == "(" and _continues_after_call(tokens, last + 1, passing):
        return []  # `NewEncoder(w).Encode(v)`: the value is what the chain ends with, not NewEncoder's
    if following in call_markers:
        cues.append(f"call:{tokens[last].text}")
        if len(chain) > 1:
            receiver = chain[-2]
            if variable_at.get(receiver) is not variable and tokens[receiver].text not in ("this", "self"):
                cues.append(f"receiver:{tokens[receiver].text}")
    elif following == "[":
        if variable_at.get(last) is not variable:
            cues.append(f"receiver:{tokens[last].text}")
    elif len(chain) > 1 and (following in _ENDS or tokens[last + 1].line != tokens[last].line):
        cues.append(f"attribute:{tokens[last].text}")
    return cues


def _continues_after_call(tokens: list[Token], opening: int, passing: frozenset[str] = frozenset()) -> bool:
    """Whether the call whose `(` is at `opening` is followed by more of the expression (`.x`, `[i]`,
    `(...)`), other than methods that hand its value on (`passing`: Rust's `.unwrap()`)."""
    while True:
        depth, closing = 0, None
        for k in range(opening, len(tokens)):
            if tokens[k].text in ("(", "[", "{"):
                depth += 1
            elif tokens[k].text in (")", "]", "}"):
                depth -= 1
                if depth == 0:
                    closing = k
                    break
        if closing is None or closing + 1 >= len(tokens):
            return False
        after = tokens[closing + 1].text
        if after == "." and closing + 3 < len(tokens) and tokens[closing + 2].text in passing and \
                tokens[closing + 3].text == "(":
            opening = closing + 3
            continue
        return after in (".", "[", "(", "->", "::")


def _loop_cues(tokens: list[Token], j: int, language, variable_at, variable) -> list[str]:
    """For a loop's variable, the collection looped over: `for (const user of users)`,
    `for (User user : users)`, `for key, user := range users`, `for user in users.iter()`; a key
    or index of it for `key` there, `for key := range users` and `for (const key in users)`."""
    k, later_names = j + 1, 0
    while k + 1 < len(tokens) and tokens[k].text == "," and tokens[k + 1].kind == NAME:
        k += 2
        later_names += 1
    if k >= len(tokens):
        return []
    word = tokens[k].text
    # The first name of `for key := range table` and of `for (const key in table)` takes keys or indexes.
    keyed = word in language.key_loop_words
    valued = False
    if word == ":=" and k + 1 < len(tokens) and tokens[k + 1].text == "range":
        k += 1
        keyed = j == 0 or tokens[j - 1].text != ","
        # `for name, pkg := range pkgs`: beside a key, the value is a map's value, which is often
        # not one of what the map's word names (`for pkgName, symbols := range refs`).
        valued = not keyed and j >= 2 and _names_a_key(tokens[j - 2].text)
    elif word not in language.loop_words or (word == ":" and not _in_loop_header(tokens, j)):
        return []
    chain = name_chain(tokens, k + 1)
    names = [tokens[c].text for c in chain if tokens[c].text not in _ITERATING_CALLS and tokens[c].text != "self"]
    if not names or variable_at.get(chain[0]) is variable:
        return []
    if later_names or keyed:
        return [f"key_of:{names[-1]}"]
    if len(chain) == 1:
        holder = variable_at.get(chain[0])
        if holder is not None:
            holder.cues = holder.cues + (f"holds:{variable.name}",)
    return [f"iterated:{names[-1]}"] + ([f"value_of:{names[-1]}"] if valued else [])


def _names_a_key(first: str) -> bool:
    """Whether the first variable of `for first, value := range x` is a map's key rather than an
    index: Go's habit is `i` (or another single letter but `k`, or `idx`) for an index, `_` for none."""
    return first != "_" and (first == "k" or len(first) > 1) and first not in ("idx", "index", "ix")


def _in_loop_header(tokens: list[Token], j: int) -> bool:
    return any(tokens[k].text in ("for", "foreach") for k in range(max(0, j - 8), j))


def _enclosing_call(tokens: list[Token], j: int) -> tuple[str, int] | None:
    """(callee, argument position) for a name passed directly to a call."""
    opening = _call_opening(tokens, j)
    if opening <= 0:
        return None
    callee = tokens[opening - 1]
    if callee.kind != NAME or callee.text in _NOT_CALLEES:
        return None
    position, depth = 0, 0
    for k in range(opening + 1, j):
        text = tokens[k].text
        if text in ("(", "[", "{"):
            depth += 1
        elif text in (")", "]", "}"):
            depth -= 1
        elif text == "," and depth == 0:
            position += 1
    return callee.text, position


def _call_opening(tokens: list[Token], j: int) -> int:
    depth = 0
    for k in range(j - 1, max(j - 400, -1), -1):
        text = tokens[k].text
        if text in (")", "]", "}"):
            depth += 1
        elif text in ("(", "[", "{"):
            if depth == 0:
                return k if text == "(" else -1
            depth -= 1
        elif text == ";" and depth == 0:
            return -1
    return -1


def declared_types(tokens: list[Token], first: int, language) -> list[str]:
    """The type written with a variable's declaration: before it (`Reader r`), after it (`r io.Reader`)
    or after a colon (`r: Reader`); "many T" for a collection of T."""
    position = language.type_position
    count = len(tokens)
    if position == "before":
        k = first - 1
        if k >= 0 and tokens[k].text == ">":
            return _generic(tokens, k, language)
        while k >= 0 and tokens[k].text in ("*", "&", "]", "["):
            k -= 1
        if k >= 0 and tokens[k].kind == NAME and tokens[k].text not in ("var", "auto", "let", "const"):
            many = first >= 1 and tokens[first - 1].text == "]"
            return [f"many {tokens[k].text}" if many else tokens[k].text]
        return []
    if position == "colon":
        k = first + 1
        while k < count and tokens[k].text in ("?", "!"):
            k += 1
        if k >= count or tokens[k].text != ":":
            return []
        k += 1
    elif position == "after":
        k = first + 1
        while k < count and tokens[k].text == ",":  # `a, b int`: the type follows the last name
            k += 2
    else:
        return []
    many = False
    while k < count and tokens[k].text in ("*", "&", "mut", "[", "]", "..."):
        many = many or tokens[k].text in ("[", "...")
        k += 1
    chain = name_chain(tokens, k, kinds=(NAME, KEYWORD))
    if not chain:
        return []
    last = chain[-1]
    if last + 1 < count and tokens[last + 1].text == "<" and tokens[last].text in language.collection_types:
        inner = last + 2
        if inner < count and tokens[inner].kind == NAME:
            return [f"many {tokens[inner].text}"]
    name = tokens[last].text
    if last + 2 < count and tokens[last + 1].text == "[" and tokens[last + 2].text == "]":
        many = True
    return [f"many {name}" if many else name]


def _generic(tokens: list[Token], closing: int, language) -> list[str]:
    """`List<User>` before a name: "many User" for a collection, else the outer type."""
    depth, k = 0, closing
    while k >= 0:
        depth += {">": 1, "<": -1}.get(tokens[k].text, 0)
        if depth == 0:
            break
        k -= 1
    if k <= 0 or tokens[k - 1].kind != NAME:
        return []
    outer = tokens[k - 1].text
    if outer in language.collection_types and k + 1 < closing and tokens[k + 1].kind == NAME:
        return [f"many {tokens[k + 1].text}"]
    return [outer]
