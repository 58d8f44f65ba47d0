"""`cognomen train`: learn from a repository and promote the new model if it is no worse."""

from __future__ import annotations

import time

from cognomen.model.measures import figure, label
from cognomen.model.pipeline import SMALL_REPOSITORY_LINES, NothingToLearn, PromotionPolicy, train_repository
from cognomen.model.training import TrainSettings

from .exits import INTERRUPTED, NOT_PROMOTED, OK, UsageError, say
from .folders import folder, repository_settings
from .store import store_for


def register(commands) -> None:
    train = commands.add_parser("train", help="learn from the code under PATH and promote the new model")
    train.add_argument("path", nargs="?", default=".")
    train.add_argument("--vocabulary-size", type=int, default=50_000, help="top-N tokens kept (default 50000)")
    train.add_argument("--min-count", type=int, default=2, help="tokens seen fewer times become unknown")
    train.add_argument("--epochs", type=int, default=5)
    train.add_argument("--seed", type=int, default=1)
    train.add_argument("--flag-budget", type=float, default=1.0,
                       help="flags allowed per 1,000 lines of clean code when calibrating (default 1)")
    train.add_argument("--flag-any-odd-name", action="store_true",
                       help="flag any name whose oddness passes the threshold, not only names the team's naming "
                            "of a collection's items contradicts: more misnames caught, most flags not worth a "
                            "rename on the packages measured")
    train.add_argument("--if-changed", action="store_true", help="do nothing when the code has not changed")
    train.add_argument("--force", action="store_true", help="promote even if the promotion check refuses")
    train.add_argument("--tolerance", type=float, default=0.02,
                       help="largest drop in 'found in top 5' or 'misnames flagged' the promotion check accepts (default 0.02); "
                            "when the held-out measurement is noisier, it accepts a drop within two standard "
                            "errors of that measurement instead, and says so")
    train.add_argument("--keep", type=int, default=4, help="models to keep in the store (default 4)")
    background = train.add_mutually_exclusive_group()
    background.add_argument("--background", action="append", metavar="DIR",
                            help="more code to learn general naming from, at a lower weight; 'stdlib' means the "
                                 "standard library of this Python (repeatable). By default, a repository with "
                                 f"under {SMALL_REPOSITORY_LINES:,} lines of Python learns from the standard library")
    background.add_argument("--no-background", action="store_true",
                            help="learn from the repository alone, however small")
    train.add_argument("--quiet", action="store_true", help="no progress on stderr")
    train.add_argument("--from-scratch", action="store_true",
                       help="train the embeddings afresh and score every file again, instead of continuing from the "
                            "current model (a weekly retrain reuses what did not change)")
    train.add_argument("--reproducible", action="store_true",
                       help="train the embeddings on one thread: the same code gives the same model, bit for bit "
                            "(about twice gensim's time; several threads finish in a different order each run)")
    train.set_defaults(handler=run)


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


def run(args) -> int:
    path = folder(args.path)
    repository_settings(path)  # a malformed settings file: one line, before any work
    store = store_for(args, path)
    settings = TrainSettings(vocabulary_size=args.vocabulary_size, min_count=args.min_count,
                             epochs=args.epochs, flag_budget=args.flag_budget, seed=args.seed,
                             flag_contradictions_only=not args.flag_any_odd_name)
    if args.reproducible:
        settings.workers = 1
    policy = PromotionPolicy(tolerance=args.tolerance, force=args.force)
    try:
        result = train_repository(path.resolve(), store, settings, policy, keep=args.keep,
                                  if_changed=args.if_changed, report=TrainReport(args.quiet),
                                  background=[] if args.no_background else args.background,
                                  from_scratch=args.from_scratch)
    except NothingToLearn as error:
        raise UsageError(str(error)) from None
    except KeyboardInterrupt:
        say("training stopped; the current model is unchanged")
        return INTERRUPTED
    if result.unchanged:
        print(f"nothing to do: {result.reason} ({result.model_id})")
        return OK
    print(summary(result, settings))
    return OK if result.promoted else NOT_PROMOTED


def summary(result, settings: TrainSettings) -> str:
    """What was learned from what, the threshold, held-out quality and time taken."""
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
    ]
    for language, entry in sorted(manifest.get("languages", {}).items()):
        if entry.get("every_contradicted_name"):
            lines.append(f"  {language:10} flags every name one of its cues contradicts (few enough in clean code: "
                         f"within {settings.flag_budget:g} per 1,000 lines)")
        elif "threshold" in entry:
            where = ", of the names one of their cues contradicts" \
                if manifest.get("settings", {}).get("flag_contradictions_only") else ""
            lines.append(f"  {language:10} flags names above {entry['threshold']:.3f}{where} (at most about "
                         f"{settings.flag_budget:g} per 1,000 lines of clean code)")
        else:
            lines.append(f"  {language:10} suggestions only: {entry.get('suggestions_only', 'no threshold')}")
    if quality:
        lines.append("  held out   " + ", ".join(f"{label(k)} {figure(v)}" for k, v in quality.items()))
    python = manifest.get("languages", {}).get("python", {}).get("lines", 0)
    if manifest.get("background_chosen") == "by default" and manifest.get("background"):
        lines.append(f"  background the standard library, at a lower weight: {python:,} lines of Python is little "
                     "to learn naming from (suggestions still come from your team's names; --no-background "
                     "learns from the repository alone)")
    reuse = manifest.get("reuse", {})
    if reuse:
        lines.append(f"  reused     embeddings {reuse.get('embeddings', '-')}; examples of "
                     f"{reuse.get('examples_reused', 0):,} unchanged files reused, "
                     f"{reuse.get('examples_computed', 0):,} computed")
    lines.append("  seconds    " + ", ".join(f"{k} {v}" for k, v in result.seconds.items()))
    if result.pruned:
        lines.append(f"  pruned     {', '.join(result.pruned)}")
    return "\n".join(lines)
