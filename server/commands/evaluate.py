"""`cognomen eval`: held-out quality of a model trained on PATH, beside two baselines."""

from __future__ import annotations

import json

from cognomen.model import bundle
from cognomen.model.corpus import TokenCache, load_corpus
from cognomen.model.evaluation import evaluate_corpus, format_table
from cognomen.model.measures import public_evaluation
from cognomen.model.pipeline import NothingToLearn, chosen_background, load_background
from cognomen.model.training import TrainSettings

from .exits import OK, UsageError
from .folders import folder, source_files
from .store import store_for


def register(commands) -> None:
    evaluate = commands.add_parser("eval", help="held-out quality of a model trained on PATH, beside baselines")
    evaluate.add_argument("path", nargs="?", default=".")
    evaluate.add_argument("--format", choices=("text", "json"), default="text")
    evaluate.add_argument("--held-out", type=float, default=0.15, help="share of files held out (default 0.15)")
    evaluate.add_argument("--epochs", type=int, default=5)
    evaluate.add_argument("--seed", type=int, default=1)
    background = evaluate.add_mutually_exclusive_group()
    background.add_argument("--background", action="append", metavar="DIR",
                            help="more code to learn general naming from, as `train` takes it (by default, as "
                                 "`train` chooses)")
    background.add_argument("--no-background", action="store_true", help="learn from the repository alone")
    evaluate.set_defaults(handler=run)


def run(args) -> int:
    path = folder(args.path)
    selection = source_files(path)
    store = store_for(args, path)
    bundle.prepare_store(store)
    corpus = load_corpus(selection, TokenCache(store / "cache"))
    settings = TrainSettings(epochs=args.epochs, seed=args.seed)
    try:
        background = load_background(chosen_background(corpus, [] if args.no_background else args.background),
                                     TokenCache(store / "cache"))
        result = evaluate_corpus(corpus, settings, held_share=args.held_out, seed=args.seed + 6, background=background)
    except NothingToLearn as error:
        raise UsageError(str(error)) from None
    except ValueError as error:
        raise UsageError(str(error)) from None
    if args.format == "json":
        print(json.dumps(public_evaluation(result), indent=2))
    else:
        print(format_table(result))
    return OK
