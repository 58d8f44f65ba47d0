"""Where each Python variable's values come from and where they go, read exactly from the ast.

Each cue is "kind:word" (see flow.py for what each kind means). A cue never comes from the
variable's own occurrences: `line = line.strip()` says nothing about the name `line`.
"""

from __future__ import annotations

import ast
import re

from ..scopes import Variable
from .python import PYTHON_BUILTINS

_RECEIVERS = frozenset({"self", "cls", "super"})
IDENTIFIER_LIKE = re.compile(r"[A-Za-z_][A-Za-z0-9_]{0,47}")
# Calls that hand back (part of) their argument: the argument names the value.
_PASS_THROUGH = frozenset({"sorted", "reversed", "list", "tuple", "set", "frozenset", "iter", "enumerate", "zip",
                           "filter", "map"})
_KEYED_READS = frozenset({"get", "pop", "setdefault", "getenv", "getattr", "getlist", "get_all", "getboolean",
                          "getint", "getfloat"})
# Calls that ask what kind of value their first argument is.
_TESTS_KIND = frozenset({"isinstance", "hasattr", "callable", "issubclass"})
_ADDING = frozenset({"append", "add", "appendleft", "put", "put_nowait", "push", "insert", "extend"})
_WRAPPERS = frozenset({"Optional", "Union", "List", "list", "Sequence", "Iterable", "Iterator", "set", "Set",
                       "frozenset", "FrozenSet", "tuple", "Tuple", "Final", "ClassVar", "Annotated", "type", "Type",
                       "Collection", "MutableSequence", "Generator", "AsyncIterator", "Awaitable"})
_COLLECTIONS = frozenset({"List", "list", "Sequence", "Iterable", "Iterator", "set", "Set", "frozenset",
                          "FrozenSet", "Collection", "MutableSequence", "Generator", "AsyncIterator"})


# The nodes cues are read from; the scope pass hands them over as it meets them (a second walk
# over the whole tree cost a third of reading a file).
FLOW_NODES = (ast.Assign, ast.AnnAssign, ast.NamedExpr, ast.For, ast.AsyncFor, ast.withitem, ast.Call, ast.Dict,
              ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda, ast.ClassDef, ast.ListComp, ast.SetComp,
              ast.DictComp, ast.GeneratorExp, ast.Return)


def python_cues(nodes: list[ast.AST], variable_at: dict[tuple[int, int], Variable], column) -> dict[int, list[str]]:
    """Cues per variable (keyed by id()) from a module's FLOW_NODES, each with the function it sits in
    (for returns); `variable_at` maps a Name's (line, character column) to its variable,
    `column(line, byte offset)` converts ast columns."""
    cues: dict[int, list[str]] = {}
    keyword_bags: set[int] = set()  # `**options` parameters: their values are whatever callers pass

    def of(node: ast.AST) -> Variable | None:
        if isinstance(node, ast.Name):
            return variable_at.get((node.lineno, column(node.lineno, node.col_offset)))
        if isinstance(node, ast.arg):
            return variable_at.get((node.lineno, column(node.lineno, node.col_offset)))
        return None

    def add(variable: Variable | None, kind: str, word: str, source: ast.AST | None = None) -> None:
        if variable is None or not word or of(source) is variable:
            return
        cues.setdefault(id(variable), []).append(f"{kind}:{word}")

    def any_values(node: ast.AST) -> bool:
        variable = of(node)
        return variable is not None and id(variable) in keyword_bags

    for node, _ in nodes:
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda)) and node.args.kwarg is not None:
            bag = of(node.args.kwarg)
            if bag is not None:
                keyword_bags.add(id(bag))
    for node, function in nodes:
        if isinstance(node, ast.Return):
            if function and node.value is not None:
                add(of(node.value), "returned", function)
        elif isinstance(node, (ast.Assign, ast.AnnAssign, ast.NamedExpr)):
            targets = node.targets if isinstance(node, ast.Assign) else [node.target]
            value = node.value
            for target in targets:
                variable = of(target)
                if variable is not None and value is not None:
                    for kind, word, source in sources(value):
                        add(variable, kind, word, source)
                if isinstance(node, ast.AnnAssign):
                    for word in annotation_types(node.annotation):
                        add(variable, "type", word)
                if isinstance(target, ast.Attribute) and of(value) is not None:
                    add(of(value), "store", target.attr)  # `self.timeout = timeout`
                elif isinstance(target, ast.Subscript) and of(value) is not None:
                    key = constant_key(target.slice)
                    if key:
                        add(of(value), "key", key)  # `settings["timeout"] = timeout`
        elif isinstance(node, (ast.For, ast.AsyncFor)):
            iter_cues(node.target, node.iter, of, add, any_values)
        elif isinstance(node, (ast.ListComp, ast.SetComp, ast.DictComp, ast.GeneratorExp)):
            for generator in node.generators:
                iter_cues(generator.target, generator.iter, of, add, any_values)
        elif isinstance(node, ast.withitem) and node.optional_vars is not None:
            variable = of(node.optional_vars)
            for kind, word, source in sources(node.context_expr):
                add(variable, kind, word, source)
        elif isinstance(node, ast.Call):
            call_cues(node, of, add)
        elif isinstance(node, ast.Dict):
            for key, value in zip(node.keys, node.values):
                word = constant_key(key) if key is not None else ""
                if word:
                    add(of(value), "key", word)  # `{"timeout": timeout}`
        elif isinstance(node, ast.ClassDef):
            for statement in node.body:
                if isinstance(statement, (ast.FunctionDef, ast.AsyncFunctionDef)) and statement.name == "__init__":
                    function_cues(statement, of, add, node.name)  # callers write `Session(...)`
        elif isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda)):
            if getattr(node, "name", "") != "__init__":
                function_cues(node, of, add)
    return cues


def sources(value: ast.AST):
    """(kind, word, node the word came from) for a right-hand side: its callee, receiver, attribute or key."""
    if isinstance(value, ast.Await):
        value = value.value
    if isinstance(value, ast.Call):
        callee = value.func
        name = callee.attr if isinstance(callee, ast.Attribute) else callee.id if isinstance(callee, ast.Name) else ""
        if name in _PASS_THROUGH and value.args:
            yield from sources(value.args[0])
            return
        if name:
            yield "call", name, None
        if isinstance(callee, ast.Attribute):
            receiver = last_name(callee.value)
            if receiver and receiver not in _RECEIVERS:
                yield "receiver", receiver, callee.value
            if name in _KEYED_READS and value.args:
                key = constant_key(value.args[0] if name != "getattr" else value.args[-1])
                if key:
                    yield "key", key, None
        elif name in ("getattr", "getenv") and len(value.args) >= 2:
            key = constant_key(value.args[1] if name == "getattr" else value.args[0])
            if key:
                yield "key", key, None
    elif isinstance(value, ast.Attribute):
        yield "attribute", value.attr, None
    elif isinstance(value, ast.Subscript):
        key = constant_key(value.slice)
        if key:
            yield "key", key, None
        else:
            container = last_name(value.value)
            if container:
                yield "receiver", container, value.value  # an item of `rows[i]` is a row


def iter_cues(target: ast.AST, iterable: ast.AST, of, add, any_values) -> None:
    """`for user in users`, `for i, user in enumerate(users)`, `for key, value in settings.items()`.
    The values of a `**fields` parameter are whatever callers pass: only its keys get a cue."""
    if isinstance(iterable, ast.Call):
        callee = iterable.func
        name = callee.attr if isinstance(callee, ast.Attribute) else callee.id if isinstance(callee, ast.Name) else ""
        if name == "enumerate" and iterable.args and isinstance(target, ast.Tuple) and len(target.elts) == 2:
            iter_cues(target.elts[1], iterable.args[0], of, add, any_values)
            return
        if name in ("items", "keys", "values") and isinstance(callee, ast.Attribute):
            container = last_name(callee.value)
            values = "" if any_values(callee.value) else container
            if name == "items" and isinstance(target, ast.Tuple) and len(target.elts) == 2:
                add(of(target.elts[0]), "key_of", container, callee.value)
                add(of(target.elts[1]), "iterated", values, callee.value)
            elif name == "keys":
                add(of(target), "key_of", container, callee.value)
            else:
                add(of(target), "iterated", values, callee.value)
            return
        if name in _PASS_THROUGH and iterable.args:
            iter_cues(target, iterable.args[0], of, add, any_values)
            return
        if name:
            add(of(target), "iterated", name, None)
        return
    container = last_name(iterable)
    if container:
        add(of(target), "key_of" if any_values(iterable) else "iterated", container, iterable)
    if isinstance(target, ast.Name):
        add(of(iterable), "holds", target.id, target)  # `for reading in readings`


def call_cues(call: ast.Call, of, add) -> None:
    """Arguments passed to a call: by position (the callee's parameter names it), by keyword, or appended."""
    callee = call.func
    name = callee.attr if isinstance(callee, ast.Attribute) else callee.id if isinstance(callee, ast.Name) else ""
    if not name:
        return
    if name in _TESTS_KIND and call.args:
        add(of(call.args[0]), "checked", name)  # the code asks what the value is
    # A builtin's parameters (`len(obj)`, `isinstance(obj, ...)`) say nothing of what is passed.
    for position, argument in enumerate(call.args if name not in PYTHON_BUILTINS else ()):
        if isinstance(argument, ast.Starred):
            break
        add(of(argument), "argument", f"{name}#{position}")
    for keyword in call.keywords:
        if keyword.arg:
            add(of(keyword.value), "keyword", keyword.arg)
    if name in _ADDING and isinstance(callee, ast.Attribute) and call.args:
        container = last_name(callee.value)
        if container:
            add(of(call.args[-1]), "added_to", container, callee.value)
        item = last_name(call.args[-1])
        if item:
            add(of(callee.value), "holds", item, call.args[-1])  # `readings.append(reading)`


def function_cues(function, of, add, called_as: str = "") -> None:
    """Parameters by position (what callers pass there) and declared type; what the function returns.
    A constructor's parameters are indexed under its class's name, as callers call it."""
    arguments = function.args
    positional = list(arguments.posonlyargs) + list(arguments.args)
    name = called_as or getattr(function, "name", "")
    skip = 1 if positional and positional[0].arg in ("self", "cls") else 0
    defaults = [None] * (len(positional) - len(arguments.defaults)) + list(arguments.defaults)
    for position, (argument, default) in enumerate(zip(positional, defaults)):
        variable = of(argument)
        if name and position >= skip:
            add(variable, "parameter", f"{name}#{position - skip}")
        if argument.annotation is not None:
            for word in annotation_types(argument.annotation):
                add(variable, "type", word)
        if default is not None and last_name(default):
            add(variable, "default", last_name(default), default)
    for argument, default in zip(arguments.kwonlyargs, arguments.kw_defaults):
        if argument.annotation is not None:
            for word in annotation_types(argument.annotation):
                add(of(argument), "type", word)


def annotation_types(annotation: ast.AST) -> list[str]:
    """The type an annotation names (`Session`), and "many:Session" style for collections."""
    if isinstance(annotation, ast.Constant) and isinstance(annotation.value, str):
        try:
            annotation = ast.parse(annotation.value, mode="eval").body
        except SyntaxError:
            return []
    if isinstance(annotation, ast.BinOp):  # `Session | None`
        return annotation_types(annotation.left) or annotation_types(annotation.right)
    if isinstance(annotation, ast.Subscript):
        outer = last_name(annotation.value)
        inner = annotation.slice.elts[0] if isinstance(annotation.slice, ast.Tuple) and annotation.slice.elts \
            else annotation.slice
        found = annotation_types(inner)
        if outer in _COLLECTIONS:
            return [f"many {word}" for word in found if not word.startswith("many ")]
        if outer in _WRAPPERS:
            return found
        return [outer] if outer else []
    name = last_name(annotation)
    return [name] if name and name != "None" else []


def last_name(node: ast.AST) -> str:
    """The last identifier of a name, attribute chain or call: `self.frames` gives frames."""
    if isinstance(node, ast.Name):
        return node.id
    if isinstance(node, ast.Attribute):
        return node.attr
    if isinstance(node, ast.Call):
        return last_name(node.func)
    return ""


def constant_key(node: ast.AST | None) -> str:
    """A string constant that could name something (`"timeout"`), else ""."""
    if isinstance(node, ast.Constant) and isinstance(node.value, str) and IDENTIFIER_LIKE.fullmatch(node.value):
        return node.value
    return ""

