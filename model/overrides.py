"""Whether a method overrides one its class inherits: then its parameters' names follow the base's.

Bases are looked up among the repository's own classes (by name, through their bases in
turn) and, for Python, among the standard library's classes the file imports.
"""

from __future__ import annotations

import functools
import importlib
import sys

# Standard modules that do something on import (open a browser, print a poem, need a screen).
_NOT_IMPORTED = frozenset({"antigravity", "this", "idlelib", "turtle", "turtledemo", "tkinter", "__main__"})


def inherited_from(owner: str, method: str, facts: dict, classes: dict[str, dict]) -> str:
    """The base (`Base.method`) whose method `owner.method` overrides, or ""."""
    own_classes = facts.get("classes", {})
    own_methods = facts.get("methods", {})
    imports = facts.get("imports", {})
    pending = [(base, owner) for base in own_classes.get(owner, classes.get(owner, {}).get("bases", []))]
    seen = {owner}
    while pending:
        base, subclass = pending.pop()
        simple = base.rsplit(".", 1)[-1]
        if base in seen:
            continue
        seen.add(base)
        # `class Handler(logging.Handler)`: a base named like its subclass is another module's class.
        local = simple != subclass or "." not in base
        if local and (simple in own_classes or simple in classes):
            methods = own_methods.get(simple) if simple in own_classes else classes[simple].get("methods", [])
            if method in methods:
                return f"{simple}.{method}"
            pending.extend((further, simple) for further in
                           (own_classes.get(simple) if simple in own_classes else classes[simple].get("bases", [])))
            continue
        if _standard_defines(_origin(base, imports), method):
            return f"{base}.{method}"
    return ""


def _origin(base: str, imports: dict[str, str]) -> str:
    """`socketserver.BaseRequestHandler` for a base written `BaseRequestHandler` or `socketserver.X`."""
    head, _, rest = base.partition(".")
    origin = imports.get(head)
    if origin is None:
        return base
    return f"{origin}.{rest}" if rest else origin


@functools.lru_cache(maxsize=512)
def _standard_defines(dotted: str, method: str) -> bool:
    """Whether a class of the running Python's standard library has the method."""
    module_name, _, class_name = dotted.rpartition(".")
    root = module_name.partition(".")[0]
    if not module_name or root not in sys.stdlib_module_names or root in _NOT_IMPORTED:
        return False
    try:
        module = importlib.import_module(module_name)
    except Exception:  # a module that does not import on this platform tells nothing
        return False
    found = getattr(module, class_name, None)
    return isinstance(found, type) and hasattr(found, method)


def repository_classes(sources) -> dict[str, dict]:
    """Each class the team defines: its bases and methods (classes of the same name merged)."""
    classes: dict[str, dict] = {}
    for source in sources:
        facts = source.facts
        for name, bases in facts.get("classes", {}).items():
            entry = classes.setdefault(name, {"bases": [], "methods": []})
            entry["bases"] = sorted(set(entry["bases"]) | set(bases))
            entry["methods"] = sorted(set(entry["methods"]) | set(facts.get("methods", {}).get(name, [])))
    return classes
