"""Learned re-ranking of a shortlist of names, including names composed from the context's sub-tokens."""

from __future__ import annotations

import math

import numpy as np

from .scoring import IGNORED_NAMES, LinearModel, NameTables, Ranking, Weights, fit_detector, reserved_words
from .tokens import join_subtokens, split_identifier

SHORTLIST = 30
MAX_COMPOSED = 12
# Leading words of function names that describe the action, not the thing returned.
VERBS = frozenset("""get set load make create read parse build compute find fetch new to is has
    open init calc calculate extract format render collect resolve lookup gen generate add
    update apply convert normalize normalise""".split())

# A name does not start with a preposition or consist of action words only.
FUNCTION_WORDS = frozenset("by of for in to from with at on as and or if is has get set".split())

FEATURES = ("count", "embedding", "lexical", "combined", "log_name_count", "composed", "log_rank",
            "count_gap", "embedding_gap", "subtokens", "verbatim_in_context")


def composed_names(tables: NameTables, ranking: Ranking, bound: frozenset[str], current: str) -> list[str]:
    """Names built from identifiers near the variable's uses (`load_user_profile` gives
    `user_profile` and `profile`) that the candidate table does not already hold."""
    style = tables.styles.get(ranking.language, "snake")
    reserved = reserved_words(ranking.language)
    found: list[str] = []
    for identifier in sorted(ranking.context_identifiers):
        parts = [p for p in split_identifier(identifier) if p.isalpha()]
        if not parts:
            continue
        # A called function's own name describes an action; the thing it returns is in its tail.
        options = [] if identifier in ranking.called_identifiers else [parts]
        if parts[0] in VERBS and len(parts) > 1:
            options.append(parts[1:])
        if len(parts) > 2:
            options.append(parts[-2:])
        if len(parts) > 1:
            options.append(parts[-1:])
        for option in options:
            if option[0] in FUNCTION_WORDS or all(part in VERBS for part in option):
                continue
            name = join_subtokens(option, style)
            if (len(name) < 2 or name == current or name in bound or name in reserved or name in IGNORED_NAMES
                    or (ranking.language, name) in tables.row_by_name or name in found):
                continue
            found.append(name)
            if len(found) >= MAX_COMPOSED:
                return found
    return found


def _composed_scores(tables: NameTables, ranking: Ranking, name: str, weights: Weights) -> tuple[float, float, float]:
    parts = split_identifier(name)
    rows = [tables.row_by_name.get((ranking.language, part)) for part in parts]
    indices = np.searchsorted(ranking.rows, [r for r in rows if r is not None]).astype(np.int64)
    count = float(ranking.count_scores[indices].mean()) if len(indices) else ranking.unseen_count
    vocabulary_rows = [tables.vocabulary.index[p] for p in parts if p in tables.vocabulary.index]
    if vocabulary_rows:
        vector = np.asarray(tables.output_vectors[vocabulary_rows], dtype=np.float32).mean(axis=0)
        embedding = float(vector @ ranking.context_vector) - ranking.embedding_normaliser
    else:
        embedding = float(ranking.embedding_scores.min())
    lexical = len(set(parts) & ranking.context_subtokens) / max(len(set(parts)), 1)
    return count, embedding, lexical


def shortlist_features(tables: NameTables, ranking: Ranking, allowed: np.ndarray, bound: frozenset[str],
                       current: str, weights: Weights) -> tuple[list[str], list[int | None], np.ndarray]:
    """The shortlist (best table names plus composed names) and each one's re-ranking features."""
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
    ]).reshape(len(top), len(FEATURES))
    features = []
    for name in composed_names(tables, ranking, bound, current):
        count, embedding, lexical = _composed_scores(tables, ranking, name, weights)
        total = weights.counts * count + weights.embedding * embedding + weights.lexical * lexical
        rank = int((combined > total).sum())
        names.append(name)
        rows.append(None)
        features.append(_row(count, embedding, lexical, total, 0.0, True, rank, best_count, best_embedding,
                             name, ranking))
    matrix = np.vstack([table_part, np.array(features, dtype=np.float64).reshape(len(features), len(FEATURES))])
    return names, rows, matrix


def _row(count, embedding, lexical, combined, name_count, composed, rank, best_count, best_embedding, name,
         ranking) -> list[float]:
    return [count, embedding, lexical, combined, math.log1p(name_count), 1.0 if composed else 0.0,
            math.log1p(rank), count - best_count, embedding - best_embedding,
            float(len(split_identifier(name))), 1.0 if name in ranking.context_identifiers else 0.0]


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
