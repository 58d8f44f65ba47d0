"""The evaluation protocol: held-out files, seeded misnames, the model beside two baselines."""

from __future__ import annotations

import math
import random
import time
from dataclasses import dataclass, field

import numpy as np

from .corpus import Corpus
from .measures import label
from .reranking import file_names, flow_names
from .scoring import (IGNORED_NAMES, Scorer, allowed_mask, detection_features, flaggable, name_fit, rank_in_batches,
                      token_ids)
from .training import TrainSettings, auc, file_local_names, rename, seed_misname, split_files, train

SCORERS = ("model", "context counts", "most frequent")


@dataclass
class Tally:
    """Raw outcomes for one scorer: oddness of clean and seeded variables, ranks of true names."""

    clean: list[float] = field(default_factory=list)
    seeded: list[float] = field(default_factory=list)
    ranks: list[int] = field(default_factory=list)  # 0 when the true name is not in the top 10
    reachable: list[bool] = field(default_factory=list)  # the true name is among the names ranked at all
    clean_over: list[float] = field(default_factory=list)  # oddness less its language's threshold (model only)
    seeded_over: list[float] = field(default_factory=list)


def recovery_at(ranks: list[int], k: int) -> float:
    """Share of seeded misnames whose true name is among the first k suggestions."""
    if not ranks:
        return float("nan")
    array = np.asarray(ranks)
    return float(((array >= 1) & (array <= k)).mean())


def false_alarms_per_kloc(clean: np.ndarray, threshold: float, lines: int) -> float:
    return float((clean > threshold).sum()) * 1000.0 / max(lines, 1)


def threshold_for_budget(clean: np.ndarray, budget: float, lines: int) -> float:
    """The lowest threshold whose false alarms on clean code stay within budget per kLOC."""
    allowed = int(budget * lines / 1000)
    ordered = np.sort(clean)[::-1]
    if len(ordered) == 0:
        return 0.0
    return float(ordered[allowed]) if allowed < len(ordered) else float(ordered[-1]) - 1e-9


def metrics(tally: Tally, lines: int, thresholded: bool) -> dict:
    clean, seeded = np.asarray(tally.clean), np.asarray(tally.seeded)
    at_one = threshold_for_budget(clean, 1.0, lines)
    result = {
        "recovery_at_1": recovery_at(tally.ranks, 1),
        "recovery_at_5": recovery_at(tally.ranks, 5),
        "detection_auc": auc(seeded, clean),
        "recall_at_1_per_kloc": float((seeded > at_one).mean()) if seeded.size else float("nan"),
    }
    if tally.reachable:
        # The ceiling for recovery: a true name the candidates (and composed names) never hold
        # cannot be suggested, however well the candidates are ordered.
        result["true_name_reachable"] = float(np.mean(tally.reachable))
    if thresholded and tally.seeded_over:
        over_clean, over_seeded = np.asarray(tally.clean_over), np.asarray(tally.seeded_over)
        result["recall_at_threshold"] = float((over_seeded > 0).mean())
        result["false_alarms_per_kloc"] = false_alarms_per_kloc(over_clean, 0.0, lines)
    return result


def evaluate_corpus(corpus: Corpus, settings: TrainSettings, held_share: float = 0.15, seed: int = 7,
                    max_variables: int = 6000, background: Corpus | None = None) -> dict:
    """Train on about 85% of the files and measure on the rest, as DESIGN.md's protocol says."""
    kept, held = split_files([f.path for f in corpus.files], held_share, seed)
    train_corpus = Corpus([f for f in corpus.files if f.path in kept], {})
    held_files = [f for f in corpus.files if f.path in held]
    if not train_corpus.files or not held_files:
        raise ValueError("too few files to hold some out: evaluation needs at least a handful of files")
    started = time.monotonic()
    trained = train(train_corpus, settings, background=background)
    trained_seconds = time.monotonic() - started
    scorer = Scorer(trained.tables, trained.detector, trained.thresholds, settings.weights, trained.reranker)
    tables = trained.tables
    tallies = {name: Tally() for name in SCORERS}
    rng = random.Random(seed)
    lines = 0
    variables = 0
    for source in held_files:
        if variables >= max_variables:
            break
        lines += source.lines
        ids = token_ids(source, tables.vocabulary)
        local_names = file_local_names(source)
        limit = scorer.threshold_for(source.language)
        judged = [v for v in source.variables if v.name not in IGNORED_NAMES and not scorer.dictated(source, v)]
        for variable, ranking in zip(judged, rank_in_batches(tables, source, judged, ids, scorer.weights)):
            if ranking is None:
                continue
            variables += 1
            allowed = allowed_mask(tables, ranking, variable.bound_names, variable.name)
            _tally(tallies, scorer, ranking, allowed, variable.name, variable, limit, clean=True)
            wrong = seed_misname(source, variable, rng, local_names)
            if wrong is None:
                continue
            _, renamed = rename(source, variable, wrong)
            allowed = allowed_mask(tables, ranking, renamed.bound_names, wrong)
            _tally(tallies, scorer, ranking, allowed, wrong, renamed, limit, clean=False, truth=variable.name)
    result = {
        "files": {"train": len(train_corpus.files), "held_out": len(held_files)},
        "held_out_lines": lines,
        "variables": variables,
        "seeded": len(tallies["model"].ranks),
        "thresholds": trained.thresholds,
        "train_seconds": round(trained_seconds, 1),
        "calibration": trained.quality,
        "scorers": {},
    }
    for name in SCORERS:
        result["scorers"][name] = metrics(tallies[name], lines, thresholded=name == "model")
    return result


def _tally(tallies: dict[str, Tally], scorer: Scorer, ranking, allowed, name, variable, limit: float, clean: bool,
           truth: str | None = None) -> None:
    tables = scorer.tables
    fit = name_fit(tables, ranking, name, scorer.weights)
    row = tables.row_by_name.get((ranking.language, name))
    frequency_oddness = -float(np.log1p(tables.name_counts[row])) if row is not None else None
    if fit is not None:
        features = detection_features(tables, ranking, allowed, fit, name, variable)
        model_oddness = float(scorer.detector.oddness(features[None, :])[0]) if scorer.detector else float(features[0])
        count_oddness = features[1]
    else:
        model_oddness = count_oddness = None
    for scorer_name, oddness in (("model", model_oddness), ("context counts", count_oddness),
                                 ("most frequent", frequency_oddness)):
        # A name that cannot be judged is never flagged: it counts as the least odd.
        value = -1e9 if oddness is None else oddness
        (tallies[scorer_name].clean if clean else tallies[scorer_name].seeded).append(value)
    if math.isfinite(limit):
        over = -1e9 if model_oddness is None or not flaggable(fit, name, ranking.flow, tables.flags_need_contradiction) else model_oddness - limit
        (tallies["model"].clean_over if clean else tallies["model"].seeded_over).append(over)
    if truth is None:
        return
    suggested = [s.name for s in scorer.suggestions(ranking, allowed, 10, variable.bound_names, name)]
    tallies["model"].ranks.append(suggested.index(truth) + 1 if truth in suggested else 0)
    row = tables.row_by_name.get((ranking.language, truth))
    in_table = row is not None and bool(allowed[int(np.searchsorted(ranking.rows, row))])
    tallies["model"].reachable.append(in_table or truth in flow_names(tables, ranking, variable.bound_names, name)
                                      or truth in file_names(tables, ranking, allowed, variable.bound_names, name))
    orders = {
        "context counts": ranking.count_scores,
        "most frequent": tables.log_counts[ranking.rows],
    }
    for scorer_name, scores in orders.items():
        masked = np.where(allowed, scores, -np.inf)
        top = np.argsort(-masked, kind="stable")[:10]
        names = [tables.names[ranking.rows[i]] for i in top if np.isfinite(masked[i])]
        tallies[scorer_name].ranks.append(names.index(truth) + 1 if truth in names else 0)


def format_table(result: dict) -> str:
    """The evaluation as a plain text table: one row per measure (named as in `measures`), one column per scorer."""
    rows = ("recovery_at_1", "recovery_at_5", "true_name_reachable", "detection_auc", "recall_at_threshold",
            "recall_at_1_per_kloc", "false_alarms_per_kloc")
    width = max(len(label(row)) for row in rows) + 2
    lines = [f"held out: {result['files']['held_out']} files, {result['held_out_lines']:,} lines, "
             f"{result['variables']:,} variables, {result['seeded']:,} {label('seeded')}",
             f"{'':{width}}" + "".join(f"{name:>16}" for name in result["scorers"])]
    for row in rows:
        cells = []
        for figures in result["scorers"].values():
            value = figures.get(row)
            cells.append(f"{'-':>16}" if value is None or value != value else f"{value:>16.3f}")
        lines.append(f"{label(row):{width}}" + "".join(cells))
    lines.append(f"({label('true_name_reachable')}: the ceiling for {label('recovery_at_5')}; a name never ranked "
                 f"cannot be suggested)")
    return "\n".join(lines)
