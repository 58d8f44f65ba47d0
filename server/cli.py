"""The `cognomen` command line."""

from __future__ import annotations

import argparse
import gc
import json
import os
import sys
import time
from pathlib import Path

from cognomen.model import bundle
from cognomen.model.bundle import ModelError
from cognomen.model.corpus import SkipFile, discover, read_source, repository_root
from cognomen.model.findings import Finding, analyse_text, check_source, suggest_at, suggestion_json
from cognomen.model.persistence import load_scorer
from cognomen.model.pipeline import GatePolicy, NothingToLearn, train_repository
from cognomen.model.training import TrainSettings

from .memory import keep_freed_memory

OK, FLAGGED, USAGE, GATE_REFUSED, INTERRUPTED = 0, 1, 2, 3, 130


class UsageError(Exception):
    """Bad input from the person at the keyboard: one line, exit 2."""


def default_store(start: Path) -> Path:
    """`.cognomen` at the top of the repository holding start (or start itself outside git)."""
    start = start if start.is_dir() else start.parent
    return (repository_root(start) or start.resolve()) / ".cognomen"


def store_for(args, start: Path | None = None) -> Path:
    if args.model_dir:
        return Path(args.model_dir)
    return default_store(start or Path.cwd())


def say(message: str) -> None:
    print(message, file=sys.stderr, flush=True)


# --- train ------------------------------------------------------------------------------


class TrainReport:
    """Progress lines on stderr: files, lexing, epochs with tokens per second and time left."""

    def __init__(self, quiet: bool):
        self.quiet = quiet
        self.last = 0.0

    def __call__(self, event: str, *args) -> None:
        if self.quiet:
            return
        now = time.monotonic()
        if event == "files":
            say(f"found {args[0]} source files")
        elif event == "lexing":
            done, total = args
            if done == total or now - self.last > 1.0:
                self.last = now
                say(f"lexing {done}/{total} changed files")
        elif event == "training":
            corpus = args[0]
            say(f"learning from {len(corpus.files)} files, {corpus.lines:,} lines, {corpus.tokens:,} tokens "
                f"({corpus.cached} unchanged files reused from the cache)")
        elif event == "epoch":
            epoch, epochs, speed, left = args
            say(f"embeddings: epoch {epoch}/{epochs}, {speed:,.0f} tokens/s, about {left:.0f} s left")


def command_train(args) -> int:
    path = Path(args.path)
    if not path.is_dir():
        raise UsageError(f"{path} is not a directory")
    store = store_for(args, path)
    settings = TrainSettings(vocabulary_size=args.vocabulary_size, min_count=args.min_count,
                             epochs=args.epochs, flag_budget=args.flag_budget, seed=args.seed)
    if args.reproducible:
        settings.workers = 1
    policy = GatePolicy(tolerance=args.tolerance, force=args.force)
    try:
        result = train_repository(path.resolve(), store, settings, policy, keep=args.keep,
                                  if_changed=args.if_changed, report=TrainReport(args.quiet),
                                  background=args.background)
    except NothingToLearn as error:
        raise UsageError(str(error)) from None
    except KeyboardInterrupt:
        say("training stopped; the current model is unchanged")
        return INTERRUPTED
    if result.unchanged:
        print(f"nothing to do: {result.reason} ({result.model_id})")
        return OK
    corpus = result.corpus
    manifest = result.manifest
    quality = manifest.get("quality", {})
    counts = manifest.get("counts", {})
    skipped = ", ".join(f"{n} {reason}" for reason, n in sorted(corpus.skipped.items())) or "none"
    lines = [
        f"model {result.model_id}: {result.reason}",
        f"  files      {counts.get('files', 0):,} learned, skipped: {skipped}"
        + (f"; {counts['background_files']:,} background files" if counts.get("background_files") else ""),
        f"  lines      {counts.get('lines', 0):,}",
        f"  tokens     {counts.get('tokens', 0):,}",
        f"  vocabulary {counts.get('vocabulary', 0):,} tokens, {counts.get('names', 0):,} candidate names",
        (f"  threshold  {manifest['threshold']:.3f} (about {settings.flag_budget:g} flag per 1,000 lines)"
         if manifest.get("threshold") is not None else
         f"  threshold  none: too little held-out code ({quality.get('calibration_lines', 0):,} lines) to "
         f"calibrate flags; suggestions only (more code, or --background stdlib for Python, fixes this)"),
    ]
    if quality:
        lines.append("  held out   " + ", ".join(f"{k} {v}" for k, v in quality.items()))
    lines.append("  seconds    " + ", ".join(f"{k} {v}" for k, v in result.seconds.items()))
    if result.pruned:
        lines.append(f"  pruned     {', '.join(result.pruned)}")
    print("\n".join(lines))
    return OK if result.promoted else GATE_REFUSED


# --- check and suggest ------------------------------------------------------------------


def load_or_explain(store: Path):
    try:
        loaded = load_scorer(store)
    except ModelError as error:
        raise UsageError(str(error)) from None
    gc.freeze()  # the model lives until the command ends: keep it out of garbage collections
    return loaded


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
    try:
        return read_source(Path(path))
    except SkipFile as skip:
        raise UsageError(f"{path}: cannot read ({skip})") from None


def command_check(args) -> int:
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


def parse_position(text: str) -> tuple[str, int, int]:
    path, _, rest = text.rpartition(":")
    path, _, line = path.rpartition(":")
    if not path or not line.isdigit() or not rest.isdigit() or int(line) < 1 or int(rest) < 1:
        raise UsageError(f"{text}: expected FILE:LINE:COLUMN with 1-based numbers")
    return path, int(line), int(rest)


def command_suggest(args) -> int:
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


# --- models -----------------------------------------------------------------------------


def command_models(args) -> int:
    store = store_for(args)
    if args.action == "use":
        if not args.model_id:
            raise UsageError("cognomen models use needs a model id (see cognomen models)")
        if not (store / "models" / args.model_id).is_dir() or args.model_id.startswith("."):
            raise UsageError(f"no model {args.model_id} in {store}")
        try:
            bundle.promote(store, args.model_id)
        except ModelError as error:
            raise UsageError(str(error)) from None
        print(f"current model is now {args.model_id}")
        return OK
    manifests = bundle.list_models(store)
    if not manifests:
        raise UsageError(f"no model found in {store}; run cognomen train")
    current = bundle.current_model_id(store)
    if args.format == "json":
        print(json.dumps({"current": current, "models": [
            {k: m.get(k) for k in ("model_id", "created", "source_commit", "counts", "quality", "threshold",
                                   "coverage")} for m in manifests]}, indent=2))
        return OK
    print(f"{'':2}{'model':24} {'created':20} {'commit':8} {'files':>6} {'vocabulary':>10} "
          f"{'recovery@5':>10} {'recall':>7} {'coverage':>8}")
    for m in manifests:
        counts, quality = m.get("counts", {}), m.get("quality", {})
        coverage = m.get("coverage", {}).get("occurrence_share")
        print(f"{'*' if m.get('model_id') == current else ' ':2}{m.get('model_id', '?'):24} "
              f"{m.get('created', ''):20} {(m.get('source_commit') or '-')[:8]:8} {counts.get('files', 0):>6} "
              f"{counts.get('vocabulary', 0):>10} {_figure(quality.get('recovery_at_5')):>10} "
              f"{_figure(quality.get('recall_at_threshold')):>7} {_figure(coverage):>8}")
    return OK


def _figure(value) -> str:
    return "-" if value is None else f"{value:.3f}"


# --- entry point ------------------------------------------------------------------------


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="cognomen", description="Learns your team's naming from its own "
                                     "code and flags variable names that do not fit how they are used.")
    parser.add_argument("--model-dir", help="model store (default: .cognomen at the repository root)")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND")

    train = commands.add_parser("train", help="learn from the code under PATH and promote the new model")
    train.add_argument("path", nargs="?", default=".")
    train.add_argument("--vocabulary-size", type=int, default=50_000, help="top-N tokens kept (default 50000)")
    train.add_argument("--min-count", type=int, default=2, help="tokens seen fewer times become unknown")
    train.add_argument("--epochs", type=int, default=5)
    train.add_argument("--seed", type=int, default=1)
    train.add_argument("--flag-budget", type=float, default=1.0,
                       help="flags allowed per 1,000 lines of clean code when calibrating (default 1)")
    train.add_argument("--if-changed", action="store_true", help="do nothing when the code has not changed")
    train.add_argument("--force", action="store_true", help="promote even if the quality gate refuses")
    train.add_argument("--tolerance", type=float, default=0.02,
                       help="largest drop in recovery@5 or recall the gate accepts (default 0.02)")
    train.add_argument("--keep", type=int, default=4, help="models to keep in the store (default 4)")
    train.add_argument("--background", action="append", default=[], metavar="DIR",
                       help="more code to learn general naming from, at a lower weight; 'stdlib' means the "
                            "standard library of this Python (useful for small repositories; repeatable)")
    train.add_argument("--quiet", action="store_true", help="no progress on stderr")
    train.add_argument("--reproducible", action="store_true",
                       help="train the embeddings on one thread: the same code gives the same model, bit for bit "
                            "(about twice gensim's time; several threads finish in a different order each run)")
    train.set_defaults(handler=command_train)

    check = commands.add_parser("check", help="flag oddly named variables in whole files")
    check.add_argument("files", nargs="+", metavar="PATH", help="files, or folders to check every source file in")
    check.add_argument("--format", choices=("text", "json"), default="text")
    check.add_argument("--threshold", type=float, help="flag above this oddness instead of the calibrated one")
    check.set_defaults(handler=command_check)

    suggest = commands.add_parser("suggest", help="ranked names for the variable at each FILE:LINE:COL")
    suggest.add_argument("positions", nargs="+", metavar="FILE:LINE:COL")
    suggest.add_argument("--format", choices=("text", "json"), default="text")
    suggest.set_defaults(handler=command_suggest)

    models = commands.add_parser("models", help="list trained models, or switch with: models use ID")
    models.add_argument("action", nargs="?", choices=("list", "use"), default="list")
    models.add_argument("model_id", nargs="?")
    models.add_argument("--format", choices=("text", "json"), default="text")
    models.set_defaults(handler=command_models)

    from . import extra_commands
    extra_commands.register(commands)
    return parser


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exit_:
        return USAGE if exit_.code not in (0, None) else OK
    if not getattr(args, "handler", None):
        parser.print_help(sys.stderr)
        return USAGE
    if args.command != "serve":
        # One-shot commands score whole files from scratch and gain most from reusing freed
        # memory. The server re-scores only what an edit touched, so it keeps its memory low.
        keep_freed_memory()
    try:
        return args.handler(args)
    except UsageError as error:
        say(f"cognomen: {error}")
        return USAGE
    except KeyboardInterrupt:
        say("cognomen: stopped")
        return INTERRUPTED
    except BrokenPipeError:
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return OK
