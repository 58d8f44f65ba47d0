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


def run(args) -> int:
    scorer, _ = load_or_explain(store_for(args))
    positions = [parse_position(p) for p in args.positions]
    results, lines = [], []
    sources = {}
    for path, line, column in positions:
        if path not in sources:
            if not Path(path).is_file():
                raise UsageError(f"{path}: no such file")
            sources[path] = analyse_text(read_document(path), path)
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
