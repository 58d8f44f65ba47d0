"""The name tables as sums over files, and a file's own share of them.

Every count the tables hold (each name's contexts, each name's uses) is a sum of per-file
contributions, so a file is scored as if the model had never seen it by subtracting its own
share (`Holdout`): leave-one-file-out without training a model per file.
"""

from __future__ import annotations

import random
from collections import Counter
from dataclasses import dataclass, field

import numpy as np

from .corpus import SourceFile
from .flow import FileFlow
from .languages import get_language
from .scoring import (_OFFSETS, IGNORED_NAMES, SMOOTHING, WINDOW, NameTables, _own_keys, _window, context_vectors,
                      dominant_style, occurrence_table, token_ids)
from .vocabulary import PAD_TOKEN, SELF_TOKEN, Vocabulary

EVIDENCE_PER_NAME = 6
_EMPTY = np.zeros(0, dtype=np.int64)


@dataclass
class FileCounts:
    """One file's share of the name tables: each counted variable's name and its context keys."""

    path: str
    language: str
    weight: float  # 1.0 for the team's files, less for a background corpus
    names: list[str]  # one per counted variable
    occurrences: np.ndarray  # (n,) occurrences counted per variable
    keys: np.ndarray  # context keys of every counted occurrence: offset slot * V + token id
    owners: np.ndarray  # which variable each key belongs to
    variables: list[int] = field(default_factory=list)  # each counted variable's index in the file
    lines: int = 0
    ids: np.ndarray | None = field(default=None, repr=False)  # the file's token ids, kept while training

    @property
    def name_weights(self) -> np.ndarray:
        return self.occurrences.astype(np.float64) * self.weight


def count_file(source: SourceFile, vocabulary: Vocabulary, weight: float = 1.0, positional: bool = True) -> FileCounts:
    """A file's contribution: for every variable with a name in the vocabulary, its contexts."""
    chosen = [k for k, v in enumerate(source.variables) if v.name not in IGNORED_NAMES and v.name in vocabulary.index]
    if not chosen:
        return FileCounts(source.path, source.language, weight, [], _EMPTY, _EMPTY, _EMPTY, [], source.lines)
    variables = [source.variables[k] for k in chosen]
    ids = token_ids(source, vocabulary)
    positions, owners, counts = occurrence_table(variables)
    contexts = _window(ids, positions, owners, _OFFSETS, _own_keys(positions, owners, len(ids)),
                       vocabulary.id(SELF_TOKEN), vocabulary.id(PAD_TOKEN))
    slots = np.arange(contexts.shape[1], dtype=np.int64) if positional else np.zeros(contexts.shape[1], np.int64)
    keys = (slots[None, :] * len(vocabulary) + contexts).ravel()
    return FileCounts(source.path, source.language, weight, [v.name for v in variables], counts, keys,
                      np.repeat(owners, contexts.shape[1]), chosen, source.lines, ids)


def build_tables(counts: list[FileCounts], sources: dict[str, SourceFile], vocabulary: Vocabulary,
                 inputs: np.ndarray, outputs: np.ndarray, names_per_language: int = 5_000,
                 positional: bool = True, seed: int = 1, background: frozenset[str] = frozenset()) -> NameTables:
    """Candidate names, position-specific context counts and evidence places from every file's share.

    Files in `background` lend their contexts at their lower weight but never their names as
    candidates nor their places as evidence: suggestions point at the team's own code.
    """
    per_language: dict[str, Counter] = {}
    variables_per_language: Counter = Counter()
    for share in counts:
        counter = per_language.setdefault(share.language, Counter())
        variables_per_language[share.language] += len(sources[share.path].variables) if share.path in sources else 0
        for name, weight in zip(share.names, share.name_weights.tolist()):
            counter[name] += weight
    team_words = _team_words(sources, background) if background else None
    names, languages, name_counts, styles = [], [], [], {}
    for language in sorted(per_language):
        counter = per_language[language]
        styles[language] = dominant_style(counter, get_language(language).naming_style)
        written = team_words.get(language, set()) if team_words is not None else None
        ranked = sorted(((name, count) for name, count in counter.items()
                         if written is None or name in written), key=lambda item: (-item[1], item[0]))
        for name, count in ranked[:names_per_language]:
            names.append(name)
            languages.append(language)
            name_counts.append(count)
    row_by_name = {(lang, name): row for row, (lang, name) in enumerate(zip(languages, names))}

    key_parts, row_parts, weight_parts = [], [], []
    for share in counts:
        rows = _rows(row_by_name, share)
        key_rows = rows[share.owners]
        keep = key_rows >= 0
        key_parts.append(share.keys[keep])
        row_parts.append(key_rows[keep])
        weight_parts.append(np.full(int(keep.sum()), share.weight))
    feature_keys, indptr, columns, values = _sum_pairs(key_parts, row_parts, weight_parts, len(names),
                                                       2 * WINDOW * len(vocabulary))
    feature_totals = np.add.reduceat(values, indptr[:-1]) if len(feature_keys) else np.zeros(0)
    evidence, chosen = _evidence(counts, sources, row_by_name, vocabulary, inputs, seed, background)
    tables = NameTables(
        vocabulary=vocabulary, input_vectors=inputs, output_vectors=outputs, names=names,
        name_languages=languages, name_counts=np.array(name_counts, dtype=np.float32),
        name_vocab_rows=np.array([vocabulary.id(n) for n in names], dtype=np.int32), styles=styles,
        name_suggestable=np.ones(len(names), dtype=bool),
        feature_keys=feature_keys, feature_totals=feature_totals.astype(np.float32), context_indptr=indptr,
        context_columns=columns.astype(np.int32), context_counts=values.astype(np.float32),
        total_occurrences=max(float(values.sum()) / (2 * WINDOW), 1.0),
        variables_per_language=dict(variables_per_language), positional=positional,
        **evidence,
    )
    tables.evidence_places = chosen  # (path, variable number) of each evidence row, while training
    return tables


def _rows(row_by_name: dict, share: FileCounts) -> np.ndarray:
    return np.array([row_by_name.get((share.language, name), -1) for name in share.names], dtype=np.int64)


def _sum_pairs(key_parts, row_parts, weight_parts, names: int, key_space: int):
    """(feature keys, CSR row pointers, name columns, summed counts) of every (context key, name) pair."""
    from scipy.sparse import coo_matrix

    if not key_parts or not sum(len(k) for k in key_parts) or not names:
        return _EMPTY.copy(), np.zeros(1, np.int64), _EMPTY.copy(), np.zeros(0)
    matrix = coo_matrix((np.concatenate(weight_parts), (np.concatenate(key_parts), np.concatenate(row_parts))),
                        shape=(key_space, names)).tocsr()
    matrix.sum_duplicates()
    matrix.sort_indices()
    per_key = np.diff(matrix.indptr)
    feature_keys = np.flatnonzero(per_key).astype(np.int64)
    indptr = np.concatenate([[0], np.cumsum(per_key[feature_keys])]).astype(np.int64)
    return feature_keys, indptr, matrix.indices.astype(np.int64), matrix.data.astype(np.float64)


def _team_words(sources: dict[str, SourceFile], background: frozenset[str]) -> dict[str, set[str]]:
    """Identifiers the team itself writes, per language, leaving out method names (`.get(`, `def get(`)."""
    team_words: dict[str, set[str]] = {}
    for source in sources.values():
        if source.path in background:
            continue
        tokens = source.tokens
        defining = get_language(source.language).defining_words | {"."}
        team_words.setdefault(source.language, set()).update(
            t.text for i, t in enumerate(tokens) if t.kind == "name" and not (
                0 < i < len(tokens) - 1 and tokens[i + 1].text == "(" and tokens[i - 1].text in defining))
    return team_words


def _evidence(counts: list[FileCounts], sources: dict[str, SourceFile], row_by_name: dict, vocabulary: Vocabulary,
              inputs: np.ndarray, seed: int, background: frozenset[str]) -> dict:
    """Up to EVIDENCE_PER_NAME places per name, from different files, each with its context vector
    (zeros until the embeddings are trained: see evidence_vectors)."""
    order = [share for share in counts if share.path not in background and share.path in sources]
    random.Random(seed).shuffle(order)
    places: dict[int, list[tuple[str, int]]] = {}
    for share in order:
        for row, variable in zip(_rows(row_by_name, share).tolist(), share.variables):
            if row < 0:
                continue
            found = places.setdefault(row, [])
            if len(found) < EVIDENCE_PER_NAME and all(path != share.path for path, _ in found):
                found.append((share.path, variable))
    evidence_rows, path_ids, lines, chosen = [], [], [], []
    paths: dict[str, int] = {}
    for row in sorted(places):
        for path, k in places[row]:
            source = sources[path]
            evidence_rows.append(row)
            path_ids.append(paths.setdefault(path, len(paths)))
            lines.append(source.tokens[source.variables[k].occurrences[0]].line)
            chosen.append((path, k))
    found = {"evidence_rows": np.array(evidence_rows, dtype=np.int32), "evidence_paths": list(paths),
             "evidence_path_ids": np.array(path_ids, dtype=np.int32),
             "evidence_lines": np.array(lines, dtype=np.int32),
             "evidence_vectors": np.zeros((len(chosen), inputs.shape[1]), dtype=np.float32)}
    found["evidence_vectors"] = evidence_vectors(chosen, counts, sources, vocabulary, inputs) if inputs.any() else \
        found["evidence_vectors"]
    return found, chosen


def evidence_vectors(chosen: list[tuple[str, int]], counts: list[FileCounts], sources: dict[str, SourceFile],
                     vocabulary: Vocabulary, inputs: np.ndarray) -> np.ndarray:
    """The context vector of each evidence place (path, variable number), in the embeddings `inputs`."""
    shares = {share.path: share for share in counts}
    by_path: dict[str, list[int]] = {}
    for number, (path, _) in enumerate(chosen):
        by_path.setdefault(path, []).append(number)
    vectors = np.zeros((len(chosen), inputs.shape[1]), dtype=np.float32)
    self_id, pad_id = vocabulary.id(SELF_TOKEN), vocabulary.id(PAD_TOKEN)
    for path, numbers in by_path.items():
        source = sources[path]
        variables = [source.variables[chosen[n][1]] for n in numbers]
        positions, owners, _ = occurrence_table(variables)
        share = shares.get(path)
        ids = share.ids if share is not None and share.ids is not None else token_ids(source, vocabulary)
        vectors[numbers] = context_vectors(inputs, self_id, pad_id, ids, positions, owners, len(variables))
    return vectors


def forget_file(tables: NameTables, source: SourceFile, weight: float = 1.0, whole_file: bool = True,
                share: FileCounts | None = None) -> tuple["Holdout", np.ndarray]:
    """A file's holdout and its token ids as a model that never saw it reads them: tokens only this
    file brought into the vocabulary are unknown."""
    from collections import Counter

    from .flow import file_flow

    vocabulary = tables.vocabulary
    counts = Counter(t.text for t in source.tokens)
    index = vocabulary.index
    unseen = frozenset(text for text, count in counts.items()
                       if text in index and vocabulary.counts[index[text]] - count < tables.min_count)
    share = share or count_file(source, vocabulary, weight, tables.positional)
    holdout = Holdout(tables, share, file_flow(source.variables, weight), whole_file, unseen)
    holdout.flow_is_current = weight == 1.0
    ids = share.ids.copy() if share.ids is not None else token_ids(source, vocabulary)
    if unseen:
        ids[np.isin(ids, np.array([index[text] for text in unseen]))] = 0
    return holdout, ids


class Holdout:
    """A file's own share of the tables, subtracted so that the file is scored as if never seen.

    `whole_file` keeps every place in the file out of the evidence (training scores files as
    if unseen); otherwise only the variable's own scope is left out.
    """

    def __init__(self, tables: NameTables, share: FileCounts, flow: FileFlow | None = None, whole_file: bool = True,
                 unseen: frozenset[str] = frozenset()):
        self.path = share.path
        self.flow = flow
        self.whole_file = whole_file
        self.unseen = unseen  # tokens in the vocabulary only because of this file
        self.flow_is_current = False  # whether `flow` is the file as it stands (then it cancels out)
        rows = _rows(tables.row_by_name, share)
        known = rows >= 0
        self.name_counts = np.zeros(len(tables.names))
        np.add.at(self.name_counts, rows[known], share.name_weights[known])
        key_rows = rows[share.owners]
        keep = key_rows >= 0
        keys = share.keys[keep]
        features = np.searchsorted(tables.feature_keys, keys)
        self.features = features
        self.rows = key_rows[keep]
        self.weight = share.weight
        # Only occurrences of names in the table count towards the total, as in `build_tables`.
        self.total = share.weight * int(keep.sum()) / (2 * WINDOW)

    def known_rows(self, tables: NameTables, rows: np.ndarray) -> np.ndarray:
        """Candidates a model trained without this file would still hold."""
        return (tables.name_counts[rows].astype(np.float64) - self.name_counts[rows]) > 1e-4

    def counts(self, tables: NameTables, rows: np.ndarray) -> np.ndarray:
        return np.maximum(tables.name_counts[rows].astype(np.float64) - self.name_counts[rows], 0.0)

    def base(self, tables: NameTables, rows: np.ndarray) -> np.ndarray:
        counts = self.counts(tables, rows)
        return (np.log(counts + 1.0) - 2 * WINDOW * np.log(counts + SMOOTHING)).astype(np.float32)

    def evidence(self, tables: NameTables, language: str, used: np.ndarray):
        """The context evidence rows for the features `used`, with this file's own counts taken out."""
        from scipy.sparse import csr_matrix

        counts = tables.raw_counts(language)[used]
        rows = tables.rows_by_language[language]
        own_columns = np.searchsorted(rows, self.rows)
        position = np.searchsorted(used, self.features)
        inside = (position < len(used)) & (used[np.minimum(position, max(len(used) - 1, 0))] == self.features) & \
            (own_columns < len(rows)) & (rows[np.minimum(own_columns, max(len(rows) - 1, 0))] == self.rows)
        own = csr_matrix((np.full(int(inside.sum()), self.weight), (position[inside], own_columns[inside])),
                         shape=counts.shape)
        # Only what the tables hold can be taken out: a file changed since training has uses the
        # tables never counted.
        taken = own.minimum(counts).tocsr()
        remaining = (counts - taken).tocsr()
        totals = tables.feature_totals[used].astype(np.float64) - np.asarray(taken.sum(axis=1)).ravel()
        prior = SMOOTHING * np.maximum(totals, 1e-9) / max(tables.total_occurrences - self.total, 1.0)
        entry_rows = np.repeat(np.arange(len(used)), np.diff(remaining.indptr))
        data = remaining.data.astype(np.float64)
        positive = data > 1e-4
        remaining.data = np.where(positive, np.log1p(np.where(positive, data, 0.0) / prior[entry_rows]),
                                  0.0).astype(np.float32)
        remaining.eliminate_zeros()
        return remaining
