"""Learned re-ranking of a shortlist: the best names of the table and the names the variable's cues put forward."""

from __future__ import annotations

import math

import numpy as np

from .flow import FEATURES as FLOW_FEATURES
from .scoring import IGNORED_NAMES, LinearModel, NameTables, Ranking, Weights, fit_detector, reserved_words
from .tokens import split_identifier

SHORTLIST = 30
MAX_FROM_FLOW = 20

TABLE_FEATURES = ("count", "embedding", "lexical", "combined", "log_name_count", "not_in_table", "log_rank",
                  "count_gap", "embedding_gap", "subtokens", "verbatim_in_context", "named_in_file")
MAX_FROM_FILE = 10
FEATURES = TABLE_FEATURES + FLOW_FEATURES


def flow_names(tables: NameTables, ranking: Ranking, bound: frozenset[str], current: str) -> list[str]:
    """Names the variable's cues put forward that may replace the current one."""
    if ranking.flow is None:
        return []
    reserved = reserved_words(ranking.language)
    found = []
    for name in ranking.flow.candidates():
        if name == current or name in bound or name in reserved or name in IGNORED_NAMES or name.startswith("_"):
            continue
        found.append(name)
        if len(found) >= MAX_FROM_FLOW:
            break
    return found


def file_names(tables: NameTables, ranking: Ranking, allowed: np.ndarray, bound: frozenset[str],
               current: str) -> list[str]:
    """Names other variables of the same file take that the table does not offer this variable (a
    name only this file gives, or one the team gives seldom), most used in the file first."""
    names = ranking.file_names
    if names is None:
        return []
    reserved = reserved_words(ranking.language)
    ordered = names.most_given()
    positions = names.table_positions(tables, ranking.language, ranking.rows)
    offered = np.zeros(len(ordered), dtype=bool)  # the table offers it already
    inside = positions >= 0
    offered[inside] = allowed[positions[inside]]
    found = []
    for k in np.flatnonzero(~offered).tolist():
        name = ordered[k]
        if name == current or name in bound or name in reserved or name in IGNORED_NAMES or name.startswith("_") \
                or len(name) < 2 or not names.has_other(name, ranking.name):
            continue
        found.append(name)
        if len(found) >= MAX_FROM_FILE:
            break
    return found


def _unseen_scores(tables: NameTables, ranking: Ranking, name: str, weights: Weights) -> tuple[float, float, float]:
    parts = split_identifier(name)
    rows = [tables.row_by_name.get((ranking.language, part)) for part in parts]
    indices = np.searchsorted(ranking.rows, [r for r in rows if r is not None]).astype(np.int64)
    count = float(ranking.count_scores[indices].mean()) if len(indices) else ranking.unseen_count
    vocabulary_rows = [tables.vocabulary.index[p] for p in parts if p in tables.vocabulary.index]
    if vocabulary_rows and weights.embedding:
        vector = np.asarray(tables.output_vectors[vocabulary_rows], dtype=np.float32).mean(axis=0)
        embedding = float(vector @ ranking.context_vector) - ranking.embedding_normaliser
    else:
        embedding = float(ranking.embedding_scores.min())
    lexical = len(set(parts) & ranking.context_subtokens) / max(len(set(parts)), 1)
    return count, embedding, lexical


def shortlist_features(tables: NameTables, ranking: Ranking, allowed: np.ndarray, bound: frozenset[str],
                       current: str, weights: Weights) -> tuple[list[str], list[int | None], np.ndarray]:
    """The shortlist (the table's best names and the names the cues put forward) and each one's features."""
    combined = np.where(allowed, ranking.combined, -np.inf)
    finite = int(np.isfinite(combined).sum())
    take = min(SHORTLIST, finite)
    top = np.argpartition(-combined, take - 1)[:take] if 0 < take < len(combined) else np.flatnonzero(
        np.isfinite(combined))
    top = top[np.argsort(-combined[top], kind="stable")]
    best_count = float(np.max(np.where(allowed, ranking.count_scores, -np.inf))) if finite else 0.0
    best_embedding = float(np.max(np.where(allowed, ranking.embedding_scores, -np.inf))) if finite else 0.0
    table_rows = ranking.rows[top]
    rows: list[int | None] = table_rows.tolist()
    names = [tables.names[row] for row in rows]
    used = ranking.held_counts[top] if ranking.held_counts is not None else tables.name_counts[table_rows]
    count, embedding = ranking.count_scores[top].astype(np.float64), ranking.embedding_scores[top].astype(np.float64)
    table_part = np.column_stack([
        count, embedding, ranking.lexical_scores[top], combined[top], np.log1p(used.astype(np.float64)),
        np.zeros(len(top)), np.log1p(np.arange(len(top))), count - best_count, embedding - best_embedding,
        tables.name_parts[table_rows], [1.0 if name in ranking.context_identifiers else 0.0 for name in names],
        [ranking.in_file(name) for name in names],
    ]).reshape(len(top), len(TABLE_FEATURES))
    features, totals = [], []
    listed = set(names)
    for name in flow_names(tables, ranking, bound, current) + file_names(tables, ranking, allowed, bound, current):
        if name in listed:
            continue
        listed.add(name)
        row = tables.row_by_name.get((ranking.language, name))
        if row is not None:
            index = int(np.searchsorted(ranking.rows, row))
            if not allowed[index]:
                continue
            count, embedding, lexical = (float(ranking.count_scores[index]), float(ranking.embedding_scores[index]),
                                         float(ranking.lexical_scores[index]))
            total, name_count = float(ranking.combined[index]), ranking.name_count(tables, row)
        else:
            count, embedding, lexical = _unseen_scores(tables, ranking, name, weights)
            total = weights.counts * count + weights.embedding * embedding + weights.lexical * lexical
            name_count = 0.0
        names.append(name)
        rows.append(row)
        totals.append(total)
        features.append(_row(count, embedding, lexical, total, name_count, row is None, 0, best_count,
                             best_embedding, name, ranking))
    if features:
        # Each flow name's rank among the allowed table names, in one comparison.
        ranks = (combined[None, :] > np.array(totals)[:, None]).sum(axis=1)
        for row_features, rank in zip(features, ranks.tolist()):
            row_features[6] = math.log1p(rank)
    matrix = np.vstack([table_part, np.array(features, dtype=np.float64).reshape(len(features), len(TABLE_FEATURES))])
    flow = ranking.flow
    flow_part = flow.features_many(names) if flow is not None else np.zeros((len(names), len(FLOW_FEATURES)))
    return names, rows, np.hstack([matrix, flow_part])


def _row(count, embedding, lexical, combined, name_count, not_in_table, rank, best_count, best_embedding, name,
         ranking) -> list[float]:
    return [count, embedding, lexical, combined, math.log1p(name_count), 1.0 if not_in_table else 0.0,
            math.log1p(rank), count - best_count, embedding - best_embedding,
            float(len(split_identifier(name))), 1.0 if name in ranking.context_identifiers else 0.0,
            ranking.in_file(name)]


class Reranker(LinearModel):
    """Logistic regression over shortlist features: which name is the one the team would use."""

    FEATURES = FEATURES

    def score(self, features: np.ndarray) -> np.ndarray:
        return self.logit(features)

    def rank(self, tables: NameTables, ranking: Ranking, allowed: np.ndarray, bound: frozenset[str], current: str,
             weights: Weights, limit: int) -> list[tuple[str, float, int | None]]:
        """(name, share of the shortlist's probability, table row or None) for the best `limit` names."""
        names, rows, features = shortlist_features(tables, ranking, allowed, bound, current, weights)
        if not names:
            return []
        scores = self.score(features)
        order = np.argsort(-scores, kind="stable")[:limit]
        shares = np.exp(scores - scores.max())
        shares /= shares.sum()
        return [(names[i], float(shares[i]), rows[i]) for i in order]


def fit_reranker(features: np.ndarray, labels: np.ndarray) -> Reranker:
    fitted = fit_detector(features, labels, l2=1.0)
    return Reranker(fitted.mean, fitted.scale, fitted.coefficients, fitted.intercept)
