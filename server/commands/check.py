"""`cognomen check`: flag oddly named variables in whole files, or every source file under a folder."""

from __future__ import annotations

import json
from pathlib import Path

from cognomen.model.corpus import SkipFile, discover, read_source
from cognomen.model.findings import Finding, analyse_text, check_source

from .exits import OK, UsageError
from .store import load_or_explain, store_for


def register(commands) -> None:
    check = commands.add_parser("check", help="flag oddly named variables in whole files")
    check.add_argument("files", nargs="+", metavar="PATH", help="files, or folders to check every source file in")
    check.add_argument("--format", choices=("text", "json"), default="text")
    check.add_argument("--threshold", type=float, help="flag above this oddness instead of the calibrated one")
    check.set_defaults(handler=run)


def finding_text(finding: Finding) -> str:
    """One compiler-style line: where, what, and what the team would call it instead."""
    head = f"{finding.path}:{finding.line}:{finding.column}: "
    if not finding.suggestions:
        return head + f"`{finding.name}` does not fit how it is used here"
    options = []
    for suggestion in finding.suggestions[:3]:
        where = ", ".join(f"{path}:{line}" for path, line in suggestion.evidence[:2])
        options.append(f"`{suggestion.name}`" + (f" (as in {where})" if where else ""))
    return head + f"`{finding.name}` does not fit how it is used here; the team would call it " + \
        " or ".join(options)


def read_document(path: str) -> str:
    """A named file's text; a usage error when it is not readable source."""
    try:
        return read_source(Path(path))
    except SkipFile as skip:
        raise UsageError(f"{path}: cannot read ({skip})") from None


def run(args) -> int:
    scorer, _ = load_or_explain(store_for(args))
    findings: list[Finding] = []
    notes: list[str] = []
    paths = source_paths(args.files)
    for path in paths:
        source = analyse_text(read_document(path), path)
        if source is None:
            notes.append(f"{path}: not a supported language; skipped")
            continue
        findings.extend(check_source(scorer, source, args.threshold))
    if args.format == "json":
        print(json.dumps({"findings": [f.to_json() for f in findings]}, indent=2))
    else:
        for note in notes:
            print(f"note: {note}")
        for finding in findings:
            print(finding_text(finding))
        print(f"{len(findings)} oddly named variable{'s' if len(findings) != 1 else ''} in "
              f"{len(paths)} file{'s' if len(paths) != 1 else ''}")
    return OK


def source_paths(arguments: list[str]) -> list[str]:
    """Files as given, and for a folder the source files under it (as `train` would pick them)."""
    paths = []
    for argument in arguments:
        given = Path(argument)
        if given.is_dir():
            selection = discover(given)
            paths.extend(str(given / relative) for relative in selection.files)
        elif given.is_file():
            paths.append(argument)
        else:
            raise UsageError(f"{argument}: no such file or folder")
    return paths
