"""Python read one top-level statement at a time, so that an edit re-reads only what it touched.

A Python function's locals never depend on code outside the top-level statement that holds
it, except for the names the module binds, which only widen what a suggestion must not
collide with. So a file can be lexed and scoped piece by piece, the pieces put back
together with shifted lines and token indices, and a piece whose text is unchanged since
the last reading taken from a cache. The result equals reading the whole file at once
(tests check this on the standard library); a piece with a syntax error falls back to the
token rules on its own instead of taking the rest of the file with it.
"""

from __future__ import annotations

import re
import threading
from collections import OrderedDict
from dataclasses import dataclass

from .languages.python import lex_python
from .languages.python_scopes import add_module_names, python_scopes, python_token_variables
from .scopes import Variable
from .tokens import NAME, Token, lex_with_pygments

# `from __future__ import annotations` changes what a piece's annotations bind; other features do not.
_FUTURE_ANNOTATIONS = re.compile(r"^from[ \t]+__future__[ \t]+import[^\n#]*\bannotations\b", re.MULTILINE)
_FUTURE_LINE = "from __future__ import annotations\n"

# A line that may begin a top-level statement: flush left, not a clause of the statement before.
_STATEMENT_START = re.compile(r"(?!(?:else|elif|except|finally)\b)[A-Za-z_@]")


@dataclass(slots=True)
class Piece:
    """One or more whole top-level statements, lexed and scoped with lines counted from 1."""

    tokens: list[Token]
    variables: list[Variable]  # bound names leave out the module's names
    module_names: frozenset[str]
    facts: dict
    placed: tuple[int, list[Token]] | None = None  # a line offset and the tokens moved there, last used


class PieceCache:
    """Pieces by their text (None for text that does not lex), least recently used dropped first.

    Safe to share between threads (the language server reads documents off its event loop).
    """

    def __init__(self, limit: int = 2048):
        self.limit = limit
        self.pieces: OrderedDict[str, Piece | None] = OrderedDict()
        self.lock = threading.Lock()

    def get(self, text: str) -> Piece | None | bool:
        """The piece for a text, None if it does not lex, False if it was never read."""
        with self.lock:
            found = self.pieces.get(text, False)
            if found is not False:
                self.pieces.move_to_end(text)
            return found

    def put(self, text: str, piece: Piece | None) -> None:
        with self.lock:
            self.pieces[text] = piece
            if len(self.pieces) > self.limit:
                self.pieces.popitem(last=False)


_TRIPLE_QUOTE = re.compile(r'"""|\'\'\'')


def statement_starts(lines: list[str]) -> list[int]:
    """Indices of the lines where a top-level statement may begin; a decorator keeps its definition.

    Lines inside a triple-quoted string are passed over by counting quotes. The count can be
    fooled (a quote inside a comment), but a wrong start only costs time: the piece before it
    fails to lex and is read on into the next one.
    """
    starts = [0]
    after_decorator = False
    open_quote = ""
    for index, line in enumerate(lines):
        inside = bool(open_quote)
        if '"""' in line or "\'\'\'" in line:
            for match in _TRIPLE_QUOTE.finditer(line):
                if not open_quote:
                    open_quote = match.group(0)
                elif match.group(0) == open_quote:
                    open_quote = ""
        if inside or not line or not _STATEMENT_START.match(line):
            continue
        if index and not after_decorator:
            starts.append(index)
        after_decorator = line.startswith("@")
    return starts


def read_python(text: str, cache: PieceCache | None = None) -> tuple[list[Token], list[Variable], dict]:
    """Tokens, variables and facts of Python source, read piece by piece (see the module's docstring)."""
    lines = text.split("\n")
    lines = [line + "\n" for line in lines[:-1]] + ([lines[-1]] if lines[-1] else [])
    starts = statement_starts(lines) + [len(lines)]
    future = _FUTURE_LINE if _FUTURE_ANNOTATIONS.search(text) else ""
    tokens: list[Token] = []
    variables: list[Variable] = []
    module_names: set[str] = set()
    facts: dict[str, dict] = {}
    first = 0
    while first < len(starts) - 1:
        last = first + 1
        piece = _piece("".join(lines[starts[first]:starts[last]]), future, cache)
        # A piece that does not lex ends inside a string or brackets: read on into the next
        # ones, twice as many each time, so a string left open while typing costs about two
        # readings of the rest of the file rather than one per statement after it.
        step = 1
        while piece is None and last < len(starts) - 1:
            last = min(last + step, len(starts) - 1)
            step *= 2
            piece = _piece("".join(lines[starts[first]:starts[last]]), future, cache)
        if piece is None:
            piece = _fallback_piece("".join(lines[starts[first]:starts[last]]))
        _append(piece, starts[first], tokens, variables)
        module_names.update(piece.module_names)
        for key, values in piece.facts.items():
            facts.setdefault(key, {}).update(values)
        first = last
    add_module_names(variables, frozenset(module_names))
    return tokens, variables, facts


def _piece(text: str, future: str, cache: PieceCache | None) -> Piece | None:
    if future and _FUTURE_ANNOTATIONS.search(text):
        future = ""  # the piece holds the import itself
    key = future + text
    if cache is not None:
        found = cache.get(key)
        if found is not False:
            return found
    tokens = lex_python(text, False, False)
    piece = None
    if tokens is not None:
        try:
            found_variables, module_names, facts = python_scopes(text, tokens, future)
        except (SyntaxError, ValueError, RecursionError, MemoryError):
            found_variables, facts = python_token_variables(tokens), {}
            # Names bound here are unknown; keep every name of the piece off the suggestion lists.
            module_names = frozenset(t.text for t in tokens if t.kind == NAME)
        found_variables = [v for v in found_variables if v.occurrences]
        found_variables.sort(key=lambda v: v.occurrences[0])
        piece = Piece(tokens, found_variables, module_names, facts)
    if cache is not None:
        cache.put(key, piece)
    return piece


def _fallback_piece(text: str) -> Piece:
    """The rest of a file that the standard tokenizer cannot read (an unclosed string): pygments."""
    tokens = lex_with_pygments(text, "python", False, False)
    found_variables = [v for v in python_token_variables(tokens) if v.occurrences]
    found_variables.sort(key=lambda v: v.occurrences[0])
    return Piece(tokens, found_variables, frozenset(t.text for t in tokens if t.kind == NAME), {})


def _append(piece: Piece, line_offset: int, tokens: list[Token], variables: list[Variable]) -> None:
    token_offset = len(tokens)
    if not line_offset:
        tokens.extend(piece.tokens)
    else:
        placed = piece.placed
        if placed is None or placed[0] != line_offset:
            placed = (line_offset, [Token(t.text, t.kind, t.line + line_offset, t.column) for t in piece.tokens])
            piece.placed = placed
        tokens.extend(placed[1])
    for v in piece.variables:
        variables.append(Variable(v.name, v.kind, [i + token_offset for i in v.occurrences],
                                  v.scope_start + line_offset, v.scope_end + line_offset, v.function,
                                  v.public_parameter, v.bound_names, v.scope_kind,
                                  tuple(i + token_offset for i in v.shorthand), v.dictated, v.owner, v.cues))
