"""`cognomen suggest`: ranked names for the variable at each FILE:LINE:COL."""

from __future__ import annotations

import json
from pathlib import Path

from cognomen.model.findings import analyse_text, suggest_at, suggestion_json

from .check import read_document
from .exits import OK, UsageError
from .store import load_or_explain, store_for


def register(commands) -> None:
    suggest = commands.add_parser("suggest", help="ranked names for the variable at each FILE:LINE:COL")
    suggest.add_argument("positions", nargs="+", metavar="FILE:LINE:COL")
    suggest.add_argument("--format", choices=("text", "json"), default="text")
    suggest.set_defaults(handler=run)


def parse_position(text: str) -> tuple[str, int, int]:
    """FILE:LINE:COLUMN with 1-based numbers; a usage error otherwise."""
    path, _, rest = text.rpartition(":")
    path, _, line = path.rpartition(":")
    if not path or not line.isdigit() or not rest.isdigit() or int(line) < 1 or int(rest) < 1:
        raise UsageError(f"{text}: expected FILE:LINE:COLUMN with 1-based numbers")
    return path, int(line), int(rest)


def inside_file(text: str, path: str, line: int, column: int) -> None:
    """A usage error for a line past the end of the file or a column past the end of its line."""
    lines = text.split("\n")
    if len(lines) > 1 and lines[-1] == "":
        lines.pop()  # the final newline ends the last line; it starts none
    where = f"{path}:{line}:{column}"
    if line > len(lines):
        raise UsageError(f"{where}: line {line} is past the end of the file ({len(lines):,} lines)")
    length = len(lines[line - 1].rstrip("\r"))
    if column > length + 1:
        raise UsageError(f"{where}: column {column} is past the end of line {line} ({length:,} characters)")


def run(args) -> int:
    scorer, _ = load_or_explain(store_for(args))
    positions = [parse_position(p) for p in args.positions]
    results, lines = [], []
    texts = {}
    for path, line, column in positions:
        if path not in texts:
            if not Path(path).is_file():
                raise UsageError(f"{path}: no such file")
            texts[path] = read_document(path)
        inside_file(texts[path], path, line, column)
    sources = {path: analyse_text(text, path) for path, text in texts.items()}
    for path, line, column in positions:
        source = sources[path]
        if source is None:
            entry = {"path": path, "line": line, "column": column, "name": None, "suggestions": [],
                     "reason": "not a supported language"}
        else:
            finding, reason = suggest_at(scorer, source, line, column)
            entry = {"path": path, "line": line, "column": column,
                     "name": finding.name if finding else None,
                     "suggestions": [suggestion_json(s) for s in finding.suggestions] if finding else []}
            if reason:
                entry["reason"] = reason
        results.append(entry)
        head = f"{path}:{line}:{column}: "
        if not entry["suggestions"]:
            lines.append(head + f"no suggestions: {entry.get('reason', 'none')}")
        else:
            ranked = ", ".join(f"{s['name']} ({s['score']:.2f})" for s in entry["suggestions"])
            lines.append(head + f"names for `{entry['name']}`: {ranked}")
    if args.format == "json":
        print(json.dumps({"results": results}, indent=2))
    else:
        print("\n".join(lines))
    return OK
