"""`cognomen vocab`: how large the team's naming vocabulary is (top-N coverage, growth, Heaps' law)."""

from __future__ import annotations

import json
from pathlib import Path

from cognomen.model import bundle
from cognomen.model.vocab_report import build_report, markdown, write_plots

from .exits import OK, UsageError
from .folders import folder, source_files
from .store import store_for


def register(commands) -> None:
    vocab = commands.add_parser("vocab", help="vocabulary report: top-N coverage, growth, Heaps' law")
    vocab.add_argument("path", nargs="?", default=".")
    vocab.add_argument("--out", metavar="DIR", help="also write vocabulary.md, vocabulary.json and plots here")
    vocab.add_argument("--format", choices=("text", "json"), default="text")
    vocab.add_argument("--max-files", type=int, default=5000, help="sample down to this many files (default 5000)")
    vocab.set_defaults(handler=run)


def run(args) -> int:
    path = folder(args.path)
    selection = source_files(path)
    report = build_report(selection.root, selection.files, model_sizes(store_for(args, path)),
                          max_files=args.max_files)
    if report.files == 0:
        raise UsageError(f"nothing to learn from: no readable source files under {path}")
    plots: list[str] = []
    if args.out:
        out = Path(args.out)
        out.mkdir(parents=True, exist_ok=True)
        plots = write_plots(report, out)
        (out / "vocabulary.json").write_text(json.dumps(report.to_json(), indent=2), encoding="utf-8")
        (out / "vocabulary.md").write_text(markdown(report, plots), encoding="utf-8")
    if args.format == "json":
        print(json.dumps(report.to_json(), indent=2))
    else:
        print(markdown(report, plots).rstrip())
        if report.sampled_from:
            print(f"\nnote: sampled {report.files:,} of {report.sampled_from:,} files; raise --max-files to read more")
        if args.out and not plots:
            print("note: install matplotlib (pip install 'cognomen[plots]') for the PNG plots")
    return OK


def model_sizes(store: Path) -> tuple[int, ...]:
    """The vocabulary size of the current model, to report its coverage beside the fixed sizes."""
    current = bundle.current_model_id(store)
    if not current:
        return ()
    try:
        size = bundle.load_model(store / "models" / current).manifest.get("settings", {}).get("vocabulary_size")
    except bundle.ModelError:
        return ()
    return (int(size),) if size else ()
