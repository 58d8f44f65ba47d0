"""`cognomen check`: flag oddly named variables in whole files, or every source file under a folder."""

from __future__ import annotations

import argparse
import json
import re
import time
from collections import Counter
from pathlib import Path

from cognomen.model.corpus import MAX_FILE_BYTES, SkipFile, discover, read_settings, read_source, size_limit_reason
from cognomen.model.findings import Finding, analyse_text, check_source

from .exits import OK, UsageError, say
from .store import load_or_explain, store_for


LARGE_FILE = 256 << 10  # a file this large takes seconds: say so before starting it


def register(commands) -> None:
    check = commands.add_parser("check", help="flag oddly named variables in whole files")
    check.add_argument("files", nargs="+", metavar="PATH", help="files, or folders to check every source file in")
    check.add_argument("--format", choices=("text", "json"), default="text")
    check.add_argument("--threshold", type=float, help="flag above this oddness instead of the calibrated one")
    check.add_argument("--max-file-size", type=file_size, default=MAX_FILE_BYTES, metavar="SIZE",
                       help="skip larger files, as training does (default 1M; bytes, or with a K or M suffix)")
    check.add_argument("--quiet", action="store_true", help="no progress on stderr")
    check.set_defaults(handler=run)


def file_size(text: str) -> int:
    """A size in bytes from '1048576', '800K' or '5M' (KiB and MiB, as the summary prints them)."""
    match = re.fullmatch(r"\s*(\d+)\s*([kKmM]?)(i?[bB])?\s*", text)
    if not match:
        raise argparse.ArgumentTypeError(f"{text!r} is not a size (for example 1048576, 800K or 5M)")
    return int(match.group(1)) << {"": 0, "k": 10, "m": 20}[match.group(2).lower()]


def finding_text(finding: Finding) -> str:
    """One compiler-style line: where, what, and what the team would call it instead."""
    head = f"{finding.path}:{finding.line}:{finding.column}: "
    if not finding.suggestions:
        return head + f"`{finding.name}` does not fit how it is used here"
    options = []
    for number, suggestion in enumerate(finding.suggestions[:3]):
        where = ", ".join(f"{path}:{line}" for path, line in suggestion.evidence[:2])
        why = suggestion.reason if number == 0 and suggestion.reason else ""
        backing = "; ".join(part for part in (why, f"as in {where}" if where else "") if part)
        options.append(f"`{suggestion.name}`" + (f" ({backing})" if backing else ""))
    return head + f"`{finding.name}` does not fit how it is used here; the team would call it " + \
        " or ".join(options)


def read_document(path: str) -> str:
    """A named file's text; a usage error when it is not readable source."""
    try:
        return read_source(Path(path))
    except SkipFile as skip:
        raise UsageError(f"{path}: cannot read ({skip})") from None


def run(args) -> int:
    scorer, loaded = load_or_explain(store_for(args))
    root = trained_root(loaded.manifest)
    accepted = accepted_names(root)
    kept: list[Finding] = []
    findings: list[Finding] = []
    notes: list[str] = []
    targets, skipped = source_paths(args.files, args.max_file_size)
    progress = Progress(len(targets), args.quiet)
    checked = 0
    for index, (path, named) in enumerate(targets, 1):
        size = Path(path).stat().st_size
        if size > args.max_file_size:  # only a named file gets here: discover left out larger ones
            reason = size_limit_reason(args.max_file_size)
            skipped[reason] += 1
            notes.append(f"{path}: {reason}; skipped (--max-file-size raises the limit)")
            continue
        try:
            text = read_source(Path(path))
        except SkipFile as skip:
            if named:
                raise UsageError(f"{path}: cannot read ({skip})") from None
            skipped[str(skip)] += 1  # under a folder: skipped and counted, as training does
            continue
        source = analyse_text(text, as_trained(path, root))
        if source is None:
            notes.append(f"{path}: not a supported language; skipped")
            continue
        progress.starting(index, path, size)
        findings.extend(check_source(scorer, source, args.threshold, accepted=accepted, kept=kept))
        checked += 1
    if args.format == "json":
        report = {"findings": [f.to_json() for f in findings]}
        if skipped:
            report["skipped"] = dict(sorted(skipped.items()))
        print(json.dumps(report, indent=2))
    else:
        for note in notes:
            print(f"note: {note}")
        if skipped:
            print(f"note: skipped {plural(sum(skipped.values()), 'file')}: "
                  + ", ".join(f"{count} {reason}" for reason, count in sorted(skipped.items())))
        for finding, repeats in grouped(findings):
            print(finding_text(finding) + (f" (and {plural(len(repeats), 'more place')} like it in this file: "
                                           f"lines {', '.join(str(r.line) for r in repeats)})" if repeats else ""))
        print(f"{plural(len(findings), 'oddly named variable')} in {plural(checked, 'file')}"
              + (f"; {plural(len(kept), 'name')} kept on purpose" if kept else ""))
    return OK


def grouped(findings: list[Finding]) -> list[tuple[Finding, list[Finding]]]:
    """Findings with the repeats of one pattern in one file (the same name, the same first suggestion)
    gathered under the first of them."""
    groups: dict[tuple, list[Finding]] = {}
    for finding in findings:
        first = finding.suggestions[0].name if finding.suggestions else ""
        groups.setdefault((finding.path, finding.name, first), []).append(finding)
    return [(members[0], members[1:]) for members in groups.values()]


def trained_root(manifest: dict) -> Path | None:
    """The folder the current model learned from, if it is still there."""
    root = manifest.get("source_path")
    return Path(root) if root and Path(root).is_dir() else None


def as_trained(path: str, root: Path | None) -> str:
    """A file's path as training saw it (relative to the folder trained on), so that the model can
    tell a file it learned from; other paths stay as given."""
    if root is None:
        return path
    try:
        return Path(path).resolve().relative_to(root.resolve()).as_posix()
    except ValueError:
        return path


def accepted_names(root: Path | None) -> dict[str, list[str]]:
    """`[accepted-names]` of the repository trained on; a malformed settings file is a usage error."""
    if root is None:
        return {}
    try:
        return read_settings(root).accepted_names
    except ValueError as error:
        raise UsageError(str(error)) from None


def plural(count: int, noun: str) -> str:
    return f"{count:,} {noun}{'' if count == 1 else 's'}"


class Progress:
    """Progress on stderr on long runs: silent for the first second, then at most a line a second,
    and always before a large file."""

    def __init__(self, total: int, quiet: bool):
        self.total, self.quiet = total, quiet
        self.started = self.last = time.monotonic()

    def starting(self, index: int, path: str, size: int) -> None:
        now = time.monotonic()
        if self.quiet or (size < LARGE_FILE and (now - self.started < 1.0 or now - self.last < 1.0)):
            return
        self.last = now
        say(f"checking {index:,}/{self.total:,}: {path}" + (f" ({size >> 10:,} KiB)" if size >= LARGE_FILE else ""))


def source_paths(arguments: list[str], max_bytes: int) -> tuple[list[tuple[str, bool]], Counter]:
    """(path, named) for files as given and for the source files under each folder (as `train` would
    pick them), with counts of what was skipped under the folders and why."""
    paths, skipped, seen = [], Counter(), set()
    for argument in arguments:
        given = Path(argument)
        if given.is_dir():
            selection = discover(given, max_bytes=max_bytes)
            found = [(str(given / relative), False) for relative in selection.files]
            skipped.update(selection.skipped)
        elif given.is_file():
            found = [(argument, True)]
        else:
            raise UsageError(f"{argument}: no such file or folder")
        for path, named in found:
            if Path(path).resolve() not in seen:  # a file named and also under a named folder is checked once
                seen.add(Path(path).resolve())
                paths.append((path, named))
    return paths, skipped
