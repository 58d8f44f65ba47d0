"""Variables and their scopes. Python reads them exactly (ast + symtable, see languages/python_scopes.py);
the other languages from the token stream, by block depth and the declaration patterns each
language module supplies."""

from __future__ import annotations

import bisect
from dataclasses import dataclass, field

from .token_flow import RESULT, token_cues
from .tokens import NAME, OPERATOR, Token

PARAMETER = "parameter"
LOCAL = "local"

# Receivers are not chosen freely; they never count as misnamed nor as candidates.
RECEIVER_NAMES = frozenset({"self", "cls", "this"})


@dataclass(slots=True)
class Variable:
    """A function-local variable or parameter and the token indices of all its occurrences."""

    name: str
    kind: str
    occurrences: list[int]
    scope_start: int  # first line of the scope
    scope_end: int  # last line of the scope
    function: str = ""
    public_parameter: bool = False
    bound_names: frozenset[str] = field(default_factory=frozenset)
    scope_kind: str = "function"  # function, lambda, comprehension, or block (token-based languages)
    shorthand: tuple[int, ...] = ()  # occurrences that are also a property's name (`{timeout}`)
    dictated: str = ""  # why the name is not the team's to choose (an override's parameter...), or ""
    owner: str = ""  # the class whose method this is a parameter of
    cues: tuple[str, ...] = ()  # where its values come from and go (see flow.py), "kind:word"


def find_variables(text: str, tokens: list[Token], language: str) -> list[Variable]:
    """All function-local variables and parameters of a file, in order of their binding."""
    from .languages import get_language

    variables = [v for v in get_language(language).read(text, tokens)[0] if v.occurrences]
    variables.sort(key=lambda v: v.occurrences[0])
    return variables


# --- bindings from the token stream -----------------------------------------------------


@dataclass(slots=True)
class Block:
    start: int  # token index of "{" (or of the first token for the file)
    end: int  # token index of the matching "}"
    is_type_body: bool
    parent: int  # index into blocks, -1 for none


def token_variables(tokens: list[Token], language) -> list[Variable]:
    """Variables by block depth and the language's declaration and parameter patterns."""
    from .languages.base import KEY, SHORTHAND

    blocks, block_of = blocks_of(tokens, language)
    declarations: list[tuple[int, int, str]] = []  # (token index, block id, kind)
    member_access = language.member_access
    for i, token in enumerate(tokens):
        block = block_of[i]
        if block < 0 or blocks[block].is_type_body or (
                token.kind == OPERATOR and token.text not in language.declaration_operators):
            continue
        if i and tokens[i - 1].text in member_access:
            continue
        for index in language.declarations(tokens, i):
            declarations.append((index, block, LOCAL))
    # A loop's, catch's or closure's header binds names for its block alone; parameters are the
    # names in the parenthesised list right before a block opens.
    header_block: dict[int, int] = {}
    public_blocks: set[int] = set()
    dictated_blocks: dict[int, str] = {}  # why a function's parameter names are not its own to choose
    function_blocks: dict[int, str] = {}  # a function body's block -> the function's name
    parameter_positions: dict[int, tuple[str, int]] = {}
    for block_id, block in enumerate(blocks):
        if block.start <= 0 or block.is_type_body:
            continue
        header = language.block_header(tokens, block.start)
        starts = [k for k in header if tokens[k].text != "else"][:1]
        if starts and tokens[starts[0]].text in language.scoped_headers:
            header_block.update((k, block_id) for k in header)
        parameters = language.parameters_before(tokens, block.start)
        results = language.results_before(tokens, block.start)
        function = language.function_name(tokens, block.start) if parameters or results or header else ""
        if parameters or results or function:
            function_blocks[block_id] = function
        for position, index in enumerate(parameters):
            declarations.append((index, block_id, PARAMETER))
            if function:
                parameter_positions[index] = (function, position)
        for index in results:
            declarations.append((index, block_id, PARAMETER))
            if function:
                parameter_positions[index] = (function, RESULT)
        if parameters and language.is_public_function(tokens, header):
            public_blocks.add(block_id)
        if parameters:
            enclosing = blocks[block.parent] if block.parent >= 0 else None
            reason = language.dictated_by(tokens, header, language.block_header(tokens, enclosing.start)
                                          if enclosing is not None and enclosing.start > 0 else range(0))
            if reason:
                dictated_blocks[block_id] = reason
    declarations = [(index, header_block.get(index, block_id), kind) for index, block_id, kind in declarations]

    # Each binding's block, and the first line of each block's scope (a parameter list may start
    # lines before its body's "{").
    binding_block: dict[int, int] = {}
    first_line: dict[int, int] = {}
    for index, block_id, _ in declarations:
        binding_block.setdefault(index, block_id)
        first_line[block_id] = min(first_line.get(block_id, tokens[blocks[block_id].start].line), tokens[index].line)

    # Where each name occurs, so a variable's uses are found without scanning its whole block.
    not_uses = language.not_uses(tokens)
    declarations = [d for d in declarations if d[0] not in not_uses]
    places: dict[str, list[int]] = {}
    for j, t in enumerate(tokens):
        if t.kind == NAME and j not in not_uses:
            places.setdefault(t.text, []).append(j)
    bound_in: dict[int, frozenset[str]] = {}
    variables: list[Variable] = []
    seen: set[tuple[int, str]] = set()
    count = len(tokens)
    for index, block_id, kind in sorted(declarations):
        name = tokens[index].text
        if (block_id, name) in seen or name in RECEIVER_NAMES or name in language.receivers:
            continue
        seen.add((block_id, name))
        block = blocks[block_id]
        occurrences, shorthand = [], []
        # Until the binding is visible (a Go or Rust declaration's own right-hand side, a parameter's
        # type), its name still means whatever it meant outside.
        visible = language.visible_from(tokens, index, block.start)
        shadowed_from, shadowed_until = count, -1
        named = places.get(name, [])
        for j in named[bisect.bisect_left(named, index):bisect.bisect_left(named, block.end)]:
            if shadowed_from <= j <= shadowed_until or index < j < visible:
                continue
            other = binding_block.get(j, block_id)
            if other != block_id:
                # Another variable of the same name, bound in an inner block: from where it is visible
                # to the end of its block, the name is that variable's.
                shadowed_from = language.visible_from(tokens, j, blocks[other].start)
                shadowed_until = blocks[other].end
                continue
            if j != index and j and tokens[j - 1].text in member_access:
                continue
            inner = block_of[j]
            role = language.occurrence_role(tokens, j, blocks[inner].start if inner >= 0 else -1)
            if role == KEY:
                continue
            if role == SHORTHAND:
                shorthand.append(j)
            occurrences.append(j)
        if not occurrences or occurrences[0] != index:
            continue  # the declaration itself was a key, not a binding
        function_start = _function_block(blocks, block_id)
        bound = bound_in.get(function_start)
        if bound is None:
            bound = bound_in[function_start] = frozenset(
                tokens[j].text for j in range(blocks[function_start].start, blocks[function_start].end)
                if tokens[j].kind == NAME and not (j and tokens[j - 1].text in member_access))
        variables.append(Variable(
            name=name,
            kind=kind,
            occurrences=occurrences,
            scope_start=first_line[block_id],
            scope_end=tokens[block.end - 1].line if block.end > 0 else tokens[-1].line,
            public_parameter=kind == PARAMETER and block_id in public_blocks,
            dictated=dictated_blocks.get(block_id, "") if kind == PARAMETER else "",
            bound_names=bound,
            scope_kind="block",
            shorthand=tuple(shorthand),
            function=function_blocks.get(function_start, ""),
        ))
    returns = {j + 1: name for j, t in enumerate(tokens) if t.text == "return" and j + 1 < count
               and (name := _function_name(blocks, block_of[j], function_blocks))}
    token_cues(tokens, variables, language, parameter_positions, returns)
    return variables


def _function_name(blocks: list[Block], block_id: int, function_blocks: dict[int, str]) -> str:
    """The name of the innermost function around a block ("" when that function is anonymous)."""
    while block_id >= 0:
        if block_id in function_blocks:
            return function_blocks[block_id]
        block_id = blocks[block_id].parent
    return ""


def blocks_of(tokens: list[Token], language) -> tuple[list[Block], list[int]]:
    """Every brace block, and for each token the innermost block holding it (-1 at top level)."""
    blocks: list[Block] = []
    block_of = [-1] * len(tokens)
    stack: list[int] = []
    last_boundary = 0
    for i, token in enumerate(tokens):
        if token.text == "{" and token.kind == OPERATOR:
            blocks.append(Block(i, len(tokens), language.is_type_body(tokens, range(last_boundary, i), i),
                                stack[-1] if stack else -1))
            stack.append(len(blocks) - 1)
            last_boundary = i + 1
        elif token.text == "}" and token.kind == OPERATOR:
            if stack:
                blocks[stack.pop()].end = i
            last_boundary = i + 1
        elif token.text == ";":
            last_boundary = i + 1
        block_of[i] = stack[-1] if stack else -1
    for i, token in enumerate(tokens):
        if token.text == "{" and block_of[i] >= 0 and blocks[block_of[i]].start == i:
            block_of[i] = blocks[block_of[i]].parent
    return blocks, block_of


def _function_block(blocks: list[Block], block_id: int) -> int:
    while blocks[block_id].parent >= 0 and not blocks[blocks[block_id].parent].is_type_body:
        block_id = blocks[block_id].parent
    return block_id

