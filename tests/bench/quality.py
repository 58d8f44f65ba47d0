"""Benchmark: `eval` (the evaluation protocol) on real code in several languages, with ablations.

Corpora: the standard library of the running Python; three pure-Python packages from PyPI in
different domains, and networkx once more with its tests; moment's sources from npm
(JavaScript); golang.org/x/net from Debian's
golang-golang-x-net-dev (Go). Pinned versions are downloaded at bench time into
~/.cache/cognomen-bench (never into the repository). Prints one table per corpus and, with
--ablate, each lever switched off; writes bench-results/quality.json.
"""

from __future__ import annotations

import argparse
import dataclasses
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from common import STDLIB, save  # noqa: E402

from cognomen.model.corpus import Settings, TokenCache, discover, load_corpus  # noqa: E402
from cognomen.model.evaluation import evaluate_corpus, format_table  # noqa: E402
from cognomen.model.measures import label  # noqa: E402
from cognomen.model.pipeline import STDLIB_EXCLUDES, chosen_background, load_background  # noqa: E402
from cognomen.model.training import TrainSettings  # noqa: E402
from tests.downloads import CACHE, fetch_debian, fetch_npm, fetch_pypi  # noqa: E402

PYPI = {"requests": "2.32.3", "click": "8.1.7", "networkx": "3.4.2"}
GO_NET_VERSION = "1:0.7.0+dfsg-1"
DOMAINS = {"requests": "HTTP client", "click": "command-line interfaces", "networkx": "graph algorithms"}


def corpora() -> list[tuple[str, Path, Settings]]:
    found = [("Python standard library", STDLIB, Settings(exclude=list(STDLIB_EXCLUDES)))]
    for name, version in PYPI.items():
        found.append((f"{name} {version} ({DOMAINS[name]}, PyPI)", fetch_pypi(name, version),
                      Settings(exclude=["*/tests/*", "tests/*"])))
    # Test code names things differently (short capitalised graph names, near-identical contexts):
    # networkx once more with its tests/ folders, where the model does far worse (DEVELOPERS.md).
    found.append((f"networkx {PYPI['networkx']} with its tests (PyPI)", fetch_pypi("networkx", PYPI["networkx"]),
                  Settings()))
    # moment's src/ holds modules of several functions each; lodash's one-function files leave the
    # protocol's seeding (a name from elsewhere in the same file) almost nothing to work with.
    found.append(("moment 2.30.1 src/ (JavaScript dates, npm)", fetch_npm("moment", "2.30.1"),
                  Settings(include=["package/src/*"])))
    found.append(("golang.org/x/net 0.7.0 (Go networking, Debian golang-golang-x-net-dev)",
                  fetch_debian("golang-golang-x-net-dev", GO_NET_VERSION), Settings(exclude=["*_test.go"])))
    return found


ABLATIONS = {
    "full model": {},
    "no name flow": {"use_flow": False},
    "flags without a contradicting cue": {"flag_contradictions_only": False},
    "with embeddings in ranking and detection": {"embedding_weight": 1.0},
    "no sub-token overlap in ranking": {"lexical_weight": 0.0},
    "no context counts in ranking": {"count_weight": 0.0},
    "no learned detector (raw gap)": {"use_detector": False},
    "no learned re-ranking": {"use_reranker": False},
    "context counts as a bag (no word order)": {"positional_counts": False},
}


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--ablate", action="store_true", help="also run each lever switched off")
    parser.add_argument("--only", help="run only corpora whose label contains this text")
    parser.add_argument("--variants", help="comma-separated ablation variants to run (default: all)")
    args = parser.parse_args()
    cache = TokenCache(CACHE / "tokens")
    results = {}
    stdlib_background = None
    for corpus_label, root, settings in corpora():
        if args.only and args.only.lower() not in corpus_label.lower():
            continue
        corpus = load_corpus(discover(root, settings), cache)
        variants = dict(ABLATIONS) if args.ablate else {"full model": {}}
        if args.variants:
            wanted = {v.strip() for v in args.variants.split(",")}
            variants = {k: v for k, v in variants.items() if k in wanted}
        # As `cognomen train` does by default: a small Python repository learns from the standard library too.
        default_background = chosen_background(corpus, None)
        if args.ablate and default_background:
            variants["without the standard library as background"] = {"background": False}
        results[corpus_label] = {}
        for variant, change in variants.items():
            background = None
            if default_background and change.get("background", True):
                stdlib_background = stdlib_background or load_background(default_background, cache)
                background = stdlib_background
            train_settings = dataclasses.replace(TrainSettings(), **{k: v for k, v in change.items()
                                                                       if k != "background"})
            result = evaluate_corpus(corpus, train_settings, background=background)
            result["lines"] = corpus.lines
            results[corpus_label][variant] = result
            learned_with = " and the standard library as background" if background else ""
            print(f"\n## {corpus_label}: {variant} ({len(corpus.files)} files, {corpus.lines:,} lines{learned_with})")
            print(format_table(result))
            model, counts = result["scorers"]["model"], result["scorers"]["context counts"]
            if counts["recovery_at_5"]:
                print(f"{label('recovery_at_5')} against the count-based baseline: "
                      f"{model['recovery_at_5'] / counts['recovery_at_5']:.2f}x")
            sys.stdout.flush()
    save("quality", results)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
