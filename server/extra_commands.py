"""Commands beyond train/check/suggest/models: eval, review, vocab and serve."""

from __future__ import annotations

import json
from pathlib import Path

from cognomen.model.corpus import TokenCache, discover, load_corpus, read_settings
from cognomen.model.evaluation import evaluate_corpus, format_table
from cognomen.model.training import TrainSettings


def command_eval(args) -> int:
    from .cli import OK, UsageError, store_for

    path = Path(args.path)
    if not path.is_dir():
        raise UsageError(f"{path} is not a directory")
    selection = discover(path.resolve(), read_settings(path))
    if not selection.files:
        raise UsageError(f"nothing to learn from: 0 source files under {path}")
    corpus = load_corpus(selection, TokenCache(store_for(args, path) / "cache"))
    settings = TrainSettings(epochs=args.epochs, seed=args.seed)
    try:
        result = evaluate_corpus(corpus, settings, held_share=args.held_out, seed=args.seed + 6)
    except ValueError as error:
        raise UsageError(str(error)) from None
    if args.format == "json":
        print(json.dumps(result, indent=2))
    else:
        print(format_table(result))
    return OK


def command_review(args) -> int:
    from .cli import FLAGGED, OK, UsageError, finding_text, load_or_explain, store_for
    from .review import ReviewError, fails, level_of, repository_top, review, to_json
    from .sarif import sarif_log

    try:
        root = repository_top(Path.cwd())
    except ReviewError as error:
        raise UsageError(str(error)) from None
    scorer, _ = load_or_explain(store_for(args, root))
    try:
        result = review(scorer, root, args.base, args.head, args.threshold)
    except ReviewError as error:
        raise UsageError(str(error)) from None
    if args.format == "json":
        print(to_json(result))
    elif args.format == "sarif":
        print(json.dumps(sarif_log([(f, level_of(f)) for f in result.findings], root), indent=2))
    else:
        for finding in result.findings:
            print(finding_text(finding))
        extra = f", {result.suppressed} kept on purpose" if result.suppressed else ""
        print(f"{len(result.findings)} oddly named variable{'s' if len(result.findings) != 1 else ''} "
              f"in {result.files} changed file{'s' if result.files != 1 else ''}{extra}")
    return FLAGGED if fails(result, args.fail_on) else OK


def command_serve(args) -> int:
    from .lsp import serve

    return serve(args.model_dir, args.tcp)


def command_vocab(args) -> int:
    from cognomen.model import bundle
    from cognomen.model.vocab_report import build_report, markdown, write_plots

    from .cli import OK, UsageError, store_for

    path = Path(args.path)
    if not path.is_dir():
        raise UsageError(f"{path} is not a directory")
    try:
        selection = discover(path.resolve(), read_settings(path))
    except ValueError as error:
        raise UsageError(str(error)) from None
    if not selection.files:
        raise UsageError(f"nothing to learn from: 0 source files under {path}")
    model_sizes: tuple[int, ...] = ()
    store = store_for(args, path)
    current = bundle.current_model_id(store)
    if current:
        try:
            size = bundle.load_model(store / "models" / current).manifest.get("settings", {}).get("vocabulary_size")
            model_sizes = (int(size),) if size else ()
        except bundle.ModelError:
            pass
    report = build_report(selection.root, selection.files, model_sizes, max_files=args.max_files)
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


def register(commands) -> None:
    vocab = commands.add_parser("vocab", help="vocabulary report: top-N coverage, growth, Heaps' law")
    vocab.add_argument("path", nargs="?", default=".")
    vocab.add_argument("--out", metavar="DIR", help="also write vocabulary.md, vocabulary.json and plots here")
    vocab.add_argument("--format", choices=("text", "json"), default="text")
    vocab.add_argument("--max-files", type=int, default=5000, help="sample down to this many files (default 5000)")
    vocab.set_defaults(handler=command_vocab)

    serve = commands.add_parser("serve", help="the language server on stdin/stdout")
    serve.add_argument("--tcp", metavar="HOST:PORT", help="listen on TCP instead of stdin/stdout")
    serve.set_defaults(handler=command_serve)

    review = commands.add_parser("review", help="flag odd names that a change introduced or touched")
    review.add_argument("--base", default="HEAD", help="compare against this revision (default HEAD)")
    review.add_argument("--head", help="the change's last revision (default: the working tree)")
    review.add_argument("--format", choices=("text", "json", "sarif"), default="text")
    review.add_argument("--fail-on", choices=("warning", "error", "never"), default="warning",
                        help="exit 1 when a finding at or above this level is reported (default warning)")
    review.add_argument("--threshold", type=float, help="flag above this oddness instead of the calibrated one")
    review.set_defaults(handler=command_review)

    evaluate = commands.add_parser("eval", help="held-out quality of a model trained on PATH, beside baselines")
    evaluate.add_argument("path", nargs="?", default=".")
    evaluate.add_argument("--format", choices=("text", "json"), default="text")
    evaluate.add_argument("--held-out", type=float, default=0.15, help="share of files held out (default 0.15)")
    evaluate.add_argument("--epochs", type=int, default=5)
    evaluate.add_argument("--seed", type=int, default=1)
    evaluate.set_defaults(handler=command_eval)
