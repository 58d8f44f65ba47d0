"""How large a team's naming vocabulary is: kinds, top-N coverage, growth and Heaps' law."""

from __future__ import annotations

import math
import random
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from .corpus import SkipFile, read_source
from .languages import language_for_path, lex
from .tokens import COMMENT, KINDS, NAME, NUMBER, STRING, split_identifier
from .training import split_files

COVERAGE_SIZES = (1_000, 10_000, 60_000)
VARIANTS = ("identifiers", "subtokens", "all_tokens_raw", "all_tokens_abstracted")
VARIANT_LABELS = {
    "identifiers": "raw identifiers",
    "subtokens": "sub-tokens after splitting",
    "all_tokens_raw": "all tokens, literals and comments kept",
    "all_tokens_abstracted": "all tokens, literals abstracted, comments dropped",
}


@dataclass
class HeapsFit:
    """V = K * n ** beta, fitted by least squares in log-log space."""

    k: float
    beta: float
    r2: float


def fit_heaps(tokens_seen: np.ndarray, unique_seen: np.ndarray) -> HeapsFit:
    keep = (tokens_seen > 0) & (unique_seen > 0)
    x, y = np.log(tokens_seen[keep]), np.log(unique_seen[keep])
    if len(x) < 2 or np.ptp(x) == 0:
        return HeapsFit(float("nan"), float("nan"), float("nan"))
    beta, intercept = np.polyfit(x, y, 1)
    predicted = intercept + beta * x
    total = ((y - y.mean()) ** 2).sum()
    r2 = 1.0 - ((y - predicted) ** 2).sum() / total if total > 0 else 1.0
    return HeapsFit(float(math.exp(intercept)), float(beta), float(r2))


@dataclass
class Report:
    files: int = 0
    sampled_from: int | None = None
    kinds: dict[str, dict[str, int]] = field(default_factory=dict)
    coverage: list[dict] = field(default_factory=list)
    heaps: dict[str, HeapsFit] = field(default_factory=dict)
    growth: dict[str, list[list[int]]] = field(default_factory=dict)
    ranked_counts: list[int] = field(default_factory=list)

    def to_json(self) -> dict:
        return {
            "files": self.files,
            "sampled_from": self.sampled_from,
            "kinds": self.kinds,
            "coverage": self.coverage,
            "heaps": {name: {"k": _measured(fit.k), "beta": _measured(fit.beta), "r2": _measured(fit.r2)}
                      for name, fit in self.heaps.items()},
            "growth": self.growth,
        }


def _measured(value: float) -> float | None:
    """None for a figure too few files could measure (JSON has no NaN)."""
    return None if value != value else value


def file_streams(root: Path, paths: list[str]):
    """(path, raw tokens) for each readable source file; the rest are skipped silently."""
    for relative in paths:
        language = language_for_path(relative.rsplit("/", 1)[-1])
        if language is None:
            continue
        try:
            text = read_source(root / relative)
        except SkipFile:
            continue
        yield relative, lex(text, language, raw=True)


def build_report(root: Path, paths: list[str], model_sizes: tuple[int, ...] = (), max_files: int = 5_000,
                 seed: int = 1, growth_points: int = 60) -> Report:
    """The vocabulary report for the given files (sampled down to max_files with a fixed seed)."""
    report = Report()
    paths = list(paths)
    if len(paths) > max_files:
        report.sampled_from = len(paths)
        paths = sorted(random.Random(seed).sample(paths, max_files))
    order = list(paths)
    random.Random(seed).shuffle(order)
    kept, held = split_files(order, 0.15, seed)
    kind_total: Counter = Counter()
    kind_unique: dict[str, set] = {kind: set() for kind in KINDS}
    seen = {variant: set() for variant in VARIANTS}
    counted = {variant: 0 for variant in VARIANTS}
    curve = {variant: [] for variant in VARIANTS}
    identifier_counts: Counter = Counter()
    train_identifiers: Counter = Counter()
    held_identifiers: Counter = Counter()
    streams = list(file_streams(root, order))
    report.files = len(streams)
    step = max(1, len(streams) // growth_points)
    for index, (relative, tokens) in enumerate(streams):
        for token in tokens:
            kind_total[token.kind] += 1
            kind_unique[token.kind].add(token.text)
            counted["all_tokens_raw"] += 1
            seen["all_tokens_raw"].add((token.kind, token.text))
            if token.kind != COMMENT:
                counted["all_tokens_abstracted"] += 1
                abstracted = "<str>" if token.kind == STRING else "<num>" if token.kind == NUMBER else token.text
                seen["all_tokens_abstracted"].add(abstracted)
            if token.kind == NAME:
                counted["identifiers"] += 1
                seen["identifiers"].add(token.text)
                identifier_counts[token.text] += 1
                (held_identifiers if relative in held else train_identifiers)[token.text] += 1
                for part in split_identifier(token.text):
                    counted["subtokens"] += 1
                    seen["subtokens"].add(part)
        if index % step == 0 or index == len(streams) - 1:
            for variant in VARIANTS:
                curve[variant].append([counted[variant], len(seen[variant])])
    report.kinds = {kind: {"total": kind_total[kind], "unique": len(kind_unique[kind])} for kind in KINDS}
    report.growth = curve
    for variant in VARIANTS:
        points = np.array(curve[variant], dtype=float).reshape(-1, 2)
        report.heaps[variant] = fit_heaps(points[:, 0], points[:, 1])
    report.ranked_counts = [count for _, count in identifier_counts.most_common()]
    report.coverage = coverage_table(identifier_counts, train_identifiers, held_identifiers,
                                     sorted(set(COVERAGE_SIZES) | set(model_sizes)))
    return report


def coverage_table(counts: Counter, train: Counter, held: Counter, sizes: list[int]) -> list[dict]:
    """What the top-N identifiers cover: unique names, occurrences, and held-out out-of-vocabulary rate."""
    ranked = np.array([count for _, count in counts.most_common()], dtype=np.int64)
    cumulative = np.cumsum(ranked) if len(ranked) else np.zeros(1, np.int64)
    total = int(cumulative[-1]) if len(ranked) else 0
    train_ranked = [name for name, _ in train.most_common()]
    held_total = sum(held.values())
    rows = []
    for n in sizes:
        covered = int(cumulative[min(n, len(ranked)) - 1]) if len(ranked) else 0
        vocabulary = set(train_ranked[:n])
        held_unknown = sum(count for name, count in held.items() if name not in vocabulary)
        rows.append({
            "n": n,
            "unique_share": round(min(n, len(ranked)) / len(ranked), 4) if len(ranked) else 0.0,
            "occurrence_share": round(covered / total, 4) if total else 0.0,
            "heldout_oov_rate": round(held_unknown / held_total, 4) if held_total else None,  # no file held out
        })
    return rows


def model_coverage(counts: Counter, vocabulary_tokens: set[str]) -> dict:
    """The share of identifier occurrences (and unique identifiers) a trained vocabulary covers."""
    total = sum(counts.values())
    covered = sum(count for name, count in counts.items() if name in vocabulary_tokens)
    unique = sum(1 for name in counts if name in vocabulary_tokens)
    return {"occurrence_share": round(covered / total, 4) if total else 0.0,
            "unique_share": round(unique / len(counts), 4) if counts else 0.0}


def markdown(report: Report, plots: list[str]) -> str:
    lines = ["# Vocabulary report", ""]
    if report.sampled_from:
        lines += [f"Sampled {report.files:,} of {report.sampled_from:,} files (fixed seed).", ""]
    else:
        lines += [f"{report.files:,} file{'' if report.files == 1 else 's'}.", ""]
    lines += ["## Tokens by kind", "", "| kind | total | unique |", "|---|---:|---:|"]
    for kind, figures in report.kinds.items():
        lines.append(f"| {kind} | {figures['total']:,} | {figures['unique']:,} |")
    lines += ["", "## Top-N identifiers", "",
              "| N | unique identifiers covered | occurrences covered | held-out out-of-vocabulary rate |",
              "|---:|---:|---:|---:|"]
    for row in report.coverage:
        held_out = "too few files to measure" if row["heldout_oov_rate"] is None else f"{row['heldout_oov_rate']:.1%}"
        lines.append(f"| {row['n']:,} | {row['unique_share']:.1%} | {row['occurrence_share']:.1%} | {held_out} |")
    lines += ["", "## Growth and Heaps' law (V = K·n^β)", ""]
    measured = {variant: fit for variant, fit in report.heaps.items() if fit.beta == fit.beta}
    if measured:
        lines += ["| tokens | K | β | r² |", "|---|---:|---:|---:|"]
        lines += [f"| {VARIANT_LABELS[variant]} | {fit.k:.2f} | {fit.beta:.3f} | {fit.r2:.4f} |"
                  for variant, fit in measured.items()]
    else:
        lines.append("Too few files to measure growth.")
    for plot in plots:
        lines += ["", f"![{plot}]({plot})"]
    return "\n".join(lines) + "\n"


def write_plots(report: Report, directory: Path) -> list[str]:
    """PNG plots when matplotlib is installed; an empty list otherwise."""
    try:
        import matplotlib
        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError:
        return []
    written = []
    figure, axes = plt.subplots(figsize=(7, 4.5))
    for variant in VARIANTS:
        points = np.array(report.growth[variant], dtype=float).reshape(-1, 2)
        if len(points):
            axes.plot(points[:, 0], points[:, 1], label=VARIANT_LABELS[variant])
    axes.set_xscale("log")
    axes.set_yscale("log")
    axes.set_xlabel("tokens seen")
    axes.set_ylabel("unique tokens")
    axes.set_title("Vocabulary growth as files are added")
    axes.legend(fontsize=8)
    figure.tight_layout()
    figure.savefig(directory / "growth.png", dpi=110)
    plt.close(figure)
    written.append("growth.png")
    if report.ranked_counts:
        figure, axes = plt.subplots(figsize=(7, 4.5))
        ranks = np.arange(1, len(report.ranked_counts) + 1)
        axes.loglog(ranks, report.ranked_counts, marker=".", linestyle="none", markersize=2)
        axes.set_xlabel("rank")
        axes.set_ylabel("occurrences")
        axes.set_title("Identifier rank and frequency (Zipf)")
        figure.tight_layout()
        figure.savefig(directory / "zipf.png", dpi=110)
        plt.close(figure)
        written.append("zipf.png")
    return written
