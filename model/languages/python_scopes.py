"""Python's function-local variables, exactly: ast for where names occur, symtable for what is local."""

from __future__ import annotations

import ast
import symtable
import warnings

from ..scopes import LOCAL, PARAMETER, RECEIVER_NAMES, Variable
from ..tokens import KEYWORD, NAME, Token
from .python_flow import FLOW_NODES, python_cues


_SCOPE_NODES = (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda, ast.ListComp, ast.SetComp,
                ast.DictComp, ast.GeneratorExp, ast.ClassDef)
_COMPREHENSION_NAMES = {ast.ListComp: "listcomp", ast.SetComp: "setcomp", ast.DictComp: "dictcomp",
                        ast.GeneratorExp: "genexpr"}


# Nodes that never hold a name: contexts, operators, constants, import aliases.
_LEAVES = (ast.expr_context, ast.operator, ast.cmpop, ast.boolop, ast.unaryop, ast.Constant, ast.alias)
# Fields that hold plain text, numbers or leaves, never a node that may hold a name.
_SCALAR_FIELDS = frozenset({"id", "attr", "name", "ctx", "op", "kind", "arg", "module", "level", "type_comment",
                            "is_async", "simple", "conversion"})
_FLOW_TYPES = frozenset(FLOW_NODES)
_SCOPE_TYPES = frozenset(_SCOPE_NODES)
_BINDING_TYPES = frozenset({ast.ExceptHandler, ast.MatchAs, ast.MatchStar, ast.MatchMapping})


class _NodeKinds(dict):
    """Per node class, the fields worth walking into (or None for a class that never holds a
    name): the walk looks a class up once instead of testing every node with isinstance."""

    def __missing__(self, cls: type) -> tuple[str, ...] | None:
        fields = None if not issubclass(cls, ast.AST) or issubclass(cls, _LEAVES) else \
            tuple(field for field in cls._fields if field not in _SCALAR_FIELDS)
        self[cls] = fields
        return fields


_WALKED_FIELDS = _NodeKinds()


def _table_key(node: ast.AST) -> tuple[str, int]:
    if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
        return node.name, node.lineno
    if isinstance(node, ast.Lambda):
        return "lambda", node.lineno
    return _COMPREHENSION_NAMES[type(node)], node.lineno


class _Scope:
    __slots__ = ("node", "table", "parent", "occurrences", "function")

    def __init__(self, node, table, parent, function):
        self.node = node
        self.table = table
        self.parent = parent
        self.function = function
        self.occurrences: dict[str, list[tuple[int, int, str]]] = {}


def python_variables(text: str, tokens: list[Token]) -> tuple[list[Variable], dict]:
    """Function-local variables of a whole Python file and its facts (classes, imports);
    raises SyntaxError when it does not compile."""
    variables, module_names, facts = python_scopes(text, tokens)
    add_module_names(variables, module_names)
    return variables, facts


def add_module_names(variables: list[Variable], module_names: frozenset[str]) -> None:
    """Widen each variable's bound names by the module's (one set per scope, shared)."""
    widened: dict[frozenset[str], frozenset[str]] = {}
    for variable in variables:
        local = variable.bound_names
        if local not in widened:
            widened[local] = local | module_names
        variable.bound_names = widened[local]


def python_scopes(text: str, tokens: list[Token], future: str = "") -> tuple[list[Variable], frozenset[str], dict]:
    """Function-local variables of Python source, the names its module level binds or uses, and
    its facts: each class's bases and what its imports name.

    The variables' bound names leave the module's names out, so that the pieces of a file
    read one top-level statement at a time can be put together (see `chunks`); `future`
    holds the file's `from __future__` line for a piece that does not (it changes what
    annotations bind). Raises SyntaxError (or ValueError) for source that does not compile.
    """
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        tree = ast.parse(future + text)
        top = symtable.symtable(future + text, "<file>", "exec")
    shift = future.count("\n")
    if shift:
        ast.increment_lineno(tree, -shift)
    lines = text.split("\n")
    wide_lines = {number for number, line in enumerate(lines, 1) if not line.isascii()}
    name_index = {(t.line, t.column): i for i, t in enumerate(tokens) if t.kind == NAME}
    module_names = frozenset(top.get_identifiers())

    # Match ast scope nodes to symtable children by (name, line) and order of appearance.
    flow_nodes: list[tuple[ast.AST, str]] = []  # what name-flow cues are read from, with their function
    scopes: list[_Scope] = []

    def children_by_key(table) -> dict[tuple[str, int], list]:
        grouped: dict[tuple[str, int], list] = {}
        for child in table.get_children():
            grouped.setdefault((child.get_name(), child.get_lineno() - shift), []).append(child)
        return grouped

    def char_column(line: int, byte_offset: int) -> int:
        if line in wide_lines:  # ast counts bytes of UTF-8; only lines beyond ASCII differ from characters
            return len(lines[line - 1].encode("utf-8")[:byte_offset].decode("utf-8", "replace")) + 1
        return byte_offset + 1

    def resolve(scope: _Scope | None, name: str) -> _Scope | None:
        """The innermost function-like scope in which the name is local, following Python's rules."""
        first = True
        while scope is not None:
            if isinstance(scope.node, ast.ClassDef):
                if first:
                    return None
                scope = scope.parent
                continue
            try:
                symbol = scope.table.lookup(name)
            except KeyError:
                symbol = None
            if symbol is not None:
                if symbol.is_global() or symbol.is_declared_global():
                    return None
                if symbol.is_local() or symbol.is_parameter():
                    return scope
            scope = scope.parent
            first = False
        return None

    def record(scope: _Scope | None, name: str, line: int, column: int, how: str) -> None:
        owner = resolve(scope, name)
        if owner is not None:
            owner.occurrences.setdefault(name, []).append((line, column, how))

    def search_name(node: ast.AST, name: str, last: bool = False) -> tuple[int, int] | None:
        start = (node.lineno, char_column(node.lineno, node.col_offset))
        end_line = getattr(node, "end_lineno", None) or node.lineno
        end = (end_line, char_column(end_line, getattr(node, "end_col_offset", None) or 10**6))
        found = None
        for (line, column), index in _range_names(name_index, tokens, start, end):
            if tokens[index].text == name:
                found = (line, column)
                if not last:
                    break
        return found

    walked = _WALKED_FIELDS

    def visit(node: ast.AST, scope: _Scope | None, children: dict) -> None:
        for field in walked[node.__class__] or ():
            value = getattr(node, field, None)
            if value.__class__ is list:
                for item in value:
                    if walked[item.__class__] is not None:
                        visit_node(item, scope, children)
            elif walked[value.__class__] is not None:
                visit_node(value, scope, children)

    def visit_node(node: ast.AST, scope: _Scope | None, children: dict) -> None:
        cls = node.__class__
        if cls is ast.Name:
            record(scope, node.id, node.lineno, char_column(node.lineno, node.col_offset), LOCAL)
            return
        if cls in _FLOW_TYPES:
            flow_nodes.append((node, scope.function if scope is not None and isinstance(
                scope.node, (ast.FunctionDef, ast.AsyncFunctionDef)) else ""))
        if cls in _SCOPE_TYPES:
            # Decorators, defaults, bases and the first iterable belong to the enclosing scope.
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
                for decorator in node.decorator_list:
                    visit_node(decorator, scope, children)
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda)):
                for default in node.args.defaults + [d for d in node.args.kw_defaults if d]:
                    visit_node(default, scope, children)
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
                for annotated in _annotations(node):
                    visit_node(annotated, scope, children)
            if isinstance(node, ast.ClassDef):
                for base in node.bases + [k.value for k in node.keywords]:
                    visit_node(base, scope, children)
            if isinstance(node, (ast.ListComp, ast.SetComp, ast.DictComp, ast.GeneratorExp)):
                visit_node(node.generators[0].iter, scope, children)
            matches = children.get(_table_key(node))
            if not matches:
                return
            table = matches.pop(0)
            function = getattr(node, "name", "<lambda>") if not isinstance(node, ast.ClassDef) else ""
            if isinstance(node, (ast.ListComp, ast.SetComp, ast.DictComp, ast.GeneratorExp)):
                function = scope.function if scope else ""
            inner = _Scope(node, table, scope, function)
            scopes.append(inner)
            grandchildren = children_by_key(table)
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda)):
                for arg in _all_args(node.args):
                    record(inner, arg.arg, arg.lineno, char_column(arg.lineno, arg.col_offset), PARAMETER)
                body = node.body if isinstance(node.body, list) else [node.body]
                for statement in body:
                    visit_node(statement, inner, grandchildren)
            elif isinstance(node, ast.ClassDef):
                for statement in node.body:
                    visit_node(statement, inner, grandchildren)
            else:
                for index, generator in enumerate(node.generators):
                    visit_node(generator.target, inner, grandchildren)
                    if index:
                        visit_node(generator.iter, inner, grandchildren)
                    for condition in generator.ifs:
                        visit_node(condition, inner, grandchildren)
                for part in ("elt", "key", "value"):
                    if hasattr(node, part):
                        visit_node(getattr(node, part), inner, grandchildren)
            return
        if cls not in _BINDING_TYPES:
            visit(node, scope, children)
            return
        if isinstance(node, ast.ExceptHandler) and node.name:
            where = search_name(node, node.name)
            if where:
                record(scope, node.name, *where, LOCAL)
        elif isinstance(node, (ast.MatchAs, ast.MatchStar)) and node.name:
            where = search_name(node, node.name, last=True)
            if where:
                record(scope, node.name, *where, LOCAL)
        elif isinstance(node, ast.MatchMapping) and node.rest:
            where = search_name(node, node.rest, last=True)
            if where:
                record(scope, node.rest, *where, LOCAL)
        visit(node, scope, children)

    visit(tree, None, children_by_key(top))

    variables: list[Variable] = []
    by_id: dict[int, Variable] = {}
    setters = property_setters(scope.node for scope in scopes if isinstance(scope.node, ast.ClassDef))
    for scope in scopes:
        if isinstance(scope.node, ast.ClassDef):
            continue
        bound = _bound_names(scope)
        is_function = isinstance(scope.node, (ast.FunctionDef, ast.AsyncFunctionDef))
        positional_only = {a.arg for a in scope.node.args.posonlyargs} if is_function else set()
        public = is_function and not scope.node.name.startswith("_")
        dictated = (dictated_by(scope.node) or (_SETTER if (owner_class(scope), scope.node.name) in setters else "")) \
            if is_function else ""
        owner = scope.parent.node.name if is_function and scope.parent is not None and \
            isinstance(scope.parent.node, ast.ClassDef) else ""
        for name, places in scope.occurrences.items():
            symbol = scope.table.lookup(name)
            if symbol.is_imported() or symbol.is_namespace():
                continue
            indices = sorted({name_index[(line, column)] for line, column, _ in places
                              if (line, column) in name_index and tokens[name_index[(line, column)]].text == name})
            if not indices:
                continue
            is_parameter = symbol.is_parameter()
            variables.append(variable := Variable(
                name=name,
                kind=PARAMETER if is_parameter else LOCAL,
                occurrences=indices,
                scope_start=scope.node.lineno,
                scope_end=getattr(scope.node, "end_lineno", scope.node.lineno) or scope.node.lineno,
                function=scope.function,
                public_parameter=bool(is_parameter and public and name not in positional_only),
                bound_names=bound,
                scope_kind="function" if is_function else "lambda" if isinstance(scope.node, ast.Lambda)
                else "comprehension",
                dictated=(dictated or (_UNUSED if name.startswith("_") and name != "_" else "")) if is_parameter else "",
                owner=owner if is_parameter else "",
            ))
            by_id[id(variable)] = variable
    variable_at = {(tokens[i].line, tokens[i].column): v for v in variables for i in v.occurrences}
    for variable_id, found in python_cues(flow_nodes, variable_at, char_column).items():
        by_id[variable_id].cues = tuple(dict.fromkeys(found))
    return variables, module_names, module_facts(tree)


_UNUSED = "its leading underscore marks it as unused on purpose"
# Special methods whose parameters the class chooses freely: they are its own interface.
_FREE_SPECIAL = frozenset({"__init__", "__new__", "__init_subclass__", "__post_init__", "__call__",
                           "__class_getitem__", "__set_name__"})


_SETTER = "a property setter's parameter"


def owner_class(scope) -> str:
    return scope.parent.node.name if scope.parent is not None and isinstance(scope.parent.node, ast.ClassDef) else ""


def property_setters(classes) -> set[tuple[str, str]]:
    """(class, method) of methods a class body passes to `property(getter, setter, deleter)`."""
    found = set()
    for node in classes:
        for statement in node.body:
            call = getattr(statement, "value", None)
            if not isinstance(call, ast.Call) or _dotted(call.func).rsplit(".", 1)[-1] != "property":
                continue
            passed = call.args[1:3] + [k.value for k in call.keywords if k.arg in ("fset", "fdel")]
            found.update((node.name, argument.id) for argument in passed if isinstance(argument, ast.Name))
    return found


def dictated_by(node: ast.FunctionDef | ast.AsyncFunctionDef) -> str:
    """Why a function's parameter names are not the team's to choose, or ""."""
    decorators = [_dotted(d.func if isinstance(d, ast.Call) else d) for d in node.decorator_list]
    last = [d.rsplit(".", 1)[-1] for d in decorators]
    if "overload" in last:
        return "an @overload stub repeats the real function's parameters"
    if "setter" in last or "deleter" in last:
        return _SETTER
    if node.name.startswith("__") and node.name.endswith("__") and node.name not in _FREE_SPECIAL:
        return f"`{node.name}` takes the parameters Python's protocol gives it"
    if node.name.startswith("test_") or "fixture" in last:
        return "pytest passes fixtures by parameter name"
    return ""


def _dotted(node: ast.AST) -> str:
    """`a.b.c` for a name or attribute chain, "" for anything else."""
    parts = []
    while isinstance(node, ast.Attribute):
        parts.append(node.attr)
        node = node.value
    if isinstance(node, ast.Name):
        parts.append(node.id)
        return ".".join(reversed(parts))
    return ""


def module_facts(tree: ast.Module) -> dict:
    """Each class's bases (dotted, as written) and methods, and what each imported name refers to."""
    classes: dict[str, list[str]] = {}
    methods: dict[str, list[str]] = {}
    imports: dict[str, str] = {}
    pending: list[ast.AST] = list(tree.body)
    while pending:
        node = pending.pop()
        if isinstance(node, ast.ClassDef):
            classes[node.name] = [b for b in (_dotted(base) for base in node.bases) if b]
            methods[node.name] = [n.name for n in node.body if isinstance(n, (ast.FunctionDef, ast.AsyncFunctionDef))]
            pending.extend(node.body)
        elif isinstance(node, ast.Import):
            for alias in node.names:
                imports[alias.asname or alias.name.split(".")[0]] = alias.name if alias.asname else \
                    alias.name.split(".")[0]
        elif isinstance(node, ast.ImportFrom) and node.module and not node.level:
            for alias in node.names:
                imports[alias.asname or alias.name] = f"{node.module}.{alias.name}"
        elif isinstance(node, (ast.If, ast.Try)):
            pending.extend(node.body + getattr(node, "orelse", []) + getattr(node, "finalbody", []))
            for handler in getattr(node, "handlers", []):
                pending.extend(handler.body)
    return {"classes": classes, "methods": methods, "imports": imports} if classes or imports else {}


def _annotations(node) -> list[ast.AST]:
    found = [a.annotation for a in _all_args(node.args) if a.annotation is not None]
    if node.returns is not None:
        found.append(node.returns)
    return found


def _all_args(arguments: ast.arguments) -> list[ast.arg]:
    found = list(arguments.posonlyargs) + list(arguments.args)
    if arguments.vararg:
        found.append(arguments.vararg)
    found.extend(arguments.kwonlyargs)
    if arguments.kwarg:
        found.append(arguments.kwarg)
    return found


def _bound_names(scope: _Scope) -> frozenset[str]:
    """Names a new name must not take: this scope's, enclosing and nested scopes' (the module's come later)."""
    names: set[str] = set()
    outer = scope
    while outer is not None:
        names.update(outer.table.get_identifiers())
        outer = outer.parent
    pending = list(scope.table.get_children())
    while pending:
        child = pending.pop()
        names.update(child.get_identifiers())
        pending.extend(child.get_children())
    return frozenset(names)


def _range_names(name_index, tokens, start, end):
    for position, index in name_index.items():
        if start <= position <= end:
            yield position, index


def python_token_variables(tokens: list[Token]) -> list[Variable]:
    """Fallback for Python with syntax errors: assignments and parameters by indentation-free rules."""
    variables: dict[tuple[int, str], Variable] = {}
    function_start = -1
    for i, token in enumerate(tokens):
        if token.text == "def" and token.kind == KEYWORD:
            function_start = i
        if token.kind != NAME or function_start < 0:
            continue
        previous = tokens[i - 1].text if i else ""
        following = tokens[i + 1].text if i + 1 < len(tokens) else ""
        key = (function_start, token.text)
        if key in variables:
            if previous != ".":
                variables[key].occurrences.append(i)
            continue
        is_parameter = previous in ("(", ",") and following in (",", ")", ":", "=") and \
            _inside_def_header(tokens, function_start, i)
        is_binding = (following == "=" and previous not in (".", "(", ",")) or previous == "for" or previous == "as"
        if (is_parameter or is_binding) and token.text not in RECEIVER_NAMES:
            variables[key] = Variable(token.text, PARAMETER if is_parameter else LOCAL, [i],
                                      tokens[function_start].line, tokens[-1].line)
    return list(variables.values())


def _inside_def_header(tokens: list[Token], start: int, i: int) -> bool:
    for k in range(start, i):
        if tokens[k].text == ":" and tokens[k - 1].text == ")":
            return False
    return True
