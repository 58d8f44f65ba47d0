"""Leave-one-file-out: a file scored without its own share of the tables scores exactly as under
tables built without the file (real standard-library modules)."""

import hashlib

import numpy as np
import pytest

from cognomen.model.counts import Holdout, build_tables, count_file
from cognomen.model.flow import FlowView, build_index, file_flow, kept_cue
from cognomen.model.scoring import IGNORED_NAMES, rank_many, token_ids
from cognomen.model.vocabulary import build_vocabulary, count_tokens

from .conftest import STDLIB

MODULES = ["textwrap.py", "shlex.py", "fnmatch.py", "glob.py", "bisect.py", "colorsys.py", "netrc.py",
           "sched.py", "this.py", "tabnanny.py", "getopt.py", "keyword.py"]


@pytest.fixture(scope="module")
def small_corpus():
    from cognomen.model.corpus import analyse
    texts = {name: (STDLIB / name).read_text(encoding="utf-8") for name in MODULES}
    return [analyse(text, name, "python", hashlib.sha256(text.encode()).hexdigest()) for name, text in texts.items()]


def tables_from(files, vocabulary):
    vectors = np.zeros((len(vocabulary), 8), dtype=np.float32)
    shares = [count_file(f, vocabulary) for f in files]
    tables = build_tables(shares, {f.path: f for f in files}, vocabulary, vectors, vectors)
    tables.flow = build_index(files, frozenset(), frozenset(), 0.3)
    return tables


def test_scores_without_a_files_share_equal_a_model_trained_without_the_file(small_corpus):
    counts, kinds = count_tokens(f.tokens for f in small_corpus)
    vocabulary = build_vocabulary(counts, kinds, 50_000, 1)
    everything = tables_from(small_corpus, vocabulary)
    for held in ("textwrap.py", "shlex.py"):
        source = next(f for f in small_corpus if f.path == held)
        without = tables_from([f for f in small_corpus if f.path != held], vocabulary)
        variables = [v for v in source.variables if v.name not in IGNORED_NAMES]
        ids = token_ids(source, vocabulary)
        holdout = Holdout(everything, count_file(source, vocabulary), file_flow(source.variables))
        left_out = rank_many(everything, source, variables, ids, holdout=holdout)
        retrained = rank_many(without, source, variables, ids)
        compared = 0
        for variable, a, b in zip(variables, left_out, retrained):
            # Every candidate both tables hold, and that the file's removal leaves known.
            known = {everything.names[row]: index for index, row in enumerate(a.rows) if a.known[index]}
            for index, row in enumerate(b.rows):
                name = without.names[row]
                assert name in known, f"{name} is a candidate without {held} but unknown after leaving it out"
                assert a.count_scores[known[name]] == pytest.approx(b.count_scores[index], rel=1e-4, abs=1e-4), \
                    (held, variable.name, name)
                compared += 1
            assert len(known) == len(b.rows), "leaving a file out forgets exactly the names only it used"
        assert compared > 1000


def test_the_flow_index_without_a_file_equals_one_built_without_it(small_corpus):
    everything = build_index(small_corpus, frozenset(), frozenset(), 0.3)
    held = next(f for f in small_corpus if f.path == "shlex.py")
    without = build_index([f for f in small_corpus if f.path != held.path], frozenset(), frozenset(), 0.3)
    view = FlowView(everything, learned=file_flow(held.variables))
    cues = {cue for v in held.variables for cue in v.cues}
    assert len(cues) > 20
    for cue in cues:
        counts = view.counts(cue)
        expected = without.given.get(cue, {})
        if not kept_cue(cue, sum(expected.values())):
            assert counts is None, f"{cue}: a hint seen once is no evidence, with the file or without it"
            continue
        found = {name: counts.get(name) for name in expected} if counts is not None else {}
        assert found == pytest.approx(dict(expected)), cue
        if counts is not None:
            assert counts.total == pytest.approx(sum(expected.values()))


def test_an_index_updated_for_one_changed_file_equals_a_rebuild(small_corpus):
    from cognomen.model.corpus import analyse
    changed = analyse((STDLIB / "glob.py").read_text(encoding="utf-8").replace("def glob(", "def find_all("),
                      "glob.py", "python")
    before = build_index(small_corpus, frozenset(), frozenset(), 0.3)
    after_files = [changed if f.path == "glob.py" else f for f in small_corpus]
    rebuilt = build_index(after_files, frozenset(), frozenset(), 0.3)
    old = next(f for f in small_corpus if f.path == "glob.py")
    view = FlowView(before, learned=file_flow(old.variables), current=file_flow(changed.variables))
    for cue in set(rebuilt.given) | set(before.given):
        counts = view.counts(cue)
        expected = rebuilt.given.get(cue, {})
        if not kept_cue(cue, sum(expected.values())):
            assert counts is None, cue
            continue
        found = {n: counts.get(n) for n in expected} if counts is not None else {}
        assert found == pytest.approx(dict(expected)), cue


def test_a_warm_retrain_learns_embeddings_from_the_changed_files_only(small_corpus):
    """Continuing from last week's vectors: a token seen only in unchanged files keeps its input
    vector exactly (CBOW moves only the context tokens of the text it reads), tokens of the
    changed file move, a token new to the vocabulary gets a vector, and an unchanged corpus
    keeps every vector."""
    from cognomen.model.corpus import analyse
    from cognomen.model.reuse import PreviousVectors
    from cognomen.model.training import TrainSettings, train_embeddings

    settings = TrainSettings(vector_size=16, epochs=2, warm_epochs=2, workers=1)
    vocabulary = build_vocabulary(*count_tokens(f.tokens for f in small_corpus), min_count=1)
    inputs, outputs = train_embeddings(small_corpus, vocabulary, settings)
    learned = {f.path: f.digest for f in small_corpus}
    assert all(learned.values())
    previous = PreviousVectors(vocabulary.tokens, inputs, outputs, learned)

    same_inputs, _ = train_embeddings(small_corpus, vocabulary, settings, previous=previous)
    assert np.array_equal(same_inputs, inputs)

    changed_text = (STDLIB / "bisect.py").read_text(encoding="utf-8") + "\ndef halfway_marker(lo, hi):\n    return lo\n"
    changed = analyse(changed_text, "bisect.py", "python", hashlib.sha256(changed_text.encode()).hexdigest())
    files = [changed if f.path == "bisect.py" else f for f in small_corpus]
    new_vocabulary = build_vocabulary(*count_tokens(f.tokens for f in files), min_count=1)
    new_inputs, _ = train_embeddings(files, new_vocabulary, settings, previous=previous)
    in_changed = {t.text for t in changed.tokens}
    elsewhere = {t.text for f in small_corpus if f.path != "bisect.py" for t in f.tokens} - in_changed
    row = vocabulary.index
    assert elsewhere and all(np.array_equal(new_inputs[new_vocabulary.index[token]], inputs[row[token]])
                             for token in elsewhere)
    assert not np.array_equal(new_inputs[new_vocabulary.index["hi"]], inputs[row["hi"]])
    assert np.abs(new_inputs[new_vocabulary.index["halfway_marker"]]).sum() > 0
