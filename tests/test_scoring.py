"""Scores and metrics against reference libraries, and the whole job on real code."""

import keyword
import random

import numpy as np
import pytest
from scipy import special, stats

from cognomen.model.corpus import analyse
from cognomen.model.evaluation import false_alarms_per_kloc, recovery_at, threshold_for_budget
from cognomen.model.findings import check_source, suggest_at
from cognomen.model.scoring import (_logsumexp, allowed_mask, detection_features, fit_detector, lexical_fit, name_fit,
                                    rank_in_batches, reserved_words, token_ids, FEATURE_NAMES)
from cognomen.model.training import auc, calibrate, rename, seed_misname

from .conftest import HELD_OUT, STDLIB


def test_softmax_normaliser_matches_scipy():
    # Reference: scipy.special.logsumexp and softmax.
    rng = np.random.default_rng(3)
    logits = rng.normal(size=500) * 20
    assert _logsumexp(logits) == pytest.approx(special.logsumexp(logits))
    assert np.exp(logits - _logsumexp(logits)) == pytest.approx(special.softmax(logits))


def test_context_fit_matches_numpy_dot(stdlib_scorer):
    # The embedding score is a dot product of the context vector with each output vector (numpy reference).
    tables = stdlib_scorer.tables
    rows = tables.rows_by_language["python"][:50]
    context = np.asarray(tables.input_vectors[10:20]).mean(axis=0)
    ours = tables._output_by_language["python"][:50] @ context
    reference = np.array([np.dot(tables.output_vectors[tables.name_vocab_rows[r]], context) for r in rows])
    assert ours == pytest.approx(reference, rel=1e-5, abs=1e-5)


def test_auc_matches_mann_whitney():
    # Reference: AUC = U / (n1 * n2) with scipy.stats.mannwhitneyu.
    rng = np.random.default_rng(5)
    positives = rng.normal(1.0, 1.0, 300).round(1)
    negatives = rng.normal(0.0, 1.0, 400).round(1)
    u = stats.mannwhitneyu(positives, negatives, alternative="two-sided").statistic
    assert auc(positives, negatives) == pytest.approx(u / (300 * 400))


def test_metrics_on_a_hand_worked_case():
    # Ranks of the true name for 5 seeded misnames: hits at 1, 3, 6 and two misses.
    ranks = [1, 3, 6, 0, 0]
    assert recovery_at(ranks, 1) == pytest.approx(1 / 5)
    assert recovery_at(ranks, 5) == pytest.approx(2 / 5)
    # Clean oddness in 2,000 lines: with a threshold of 0.5, two clean variables exceed it.
    clean = np.array([0.1, 0.2, 0.9, 0.7, 0.3])
    assert false_alarms_per_kloc(clean, 0.5, 2000) == pytest.approx(1.0)
    # A budget of 1 per kLOC over 2,000 lines allows two flags: the threshold sits at the third highest.
    assert threshold_for_budget(clean, 1.0, 2000) == pytest.approx(0.3)
    assert calibrate(clean, 2000, 1.0) == pytest.approx(0.3)
    assert auc(np.array([2.0, 0.5]), np.array([0.0, 1.0])) == pytest.approx(0.75)


def test_lexical_fit():
    assert lexical_fit(frozenset({"user", "name"}), frozenset({"load", "user"})) == 0.5
    assert lexical_fit(frozenset(), frozenset({"x"})) == 0.0


def test_detector_separates_a_learnable_signal():
    rng = np.random.default_rng(0)
    features = rng.normal(size=(400, 13))
    labels = (features[:, 0] + 0.3 * rng.normal(size=400) > 0).astype(float)
    detector = fit_detector(features, labels)
    oddness = detector.oddness(features)
    assert auc(oddness[labels == 1], oddness[labels == 0]) > 0.95


def held_out_sources():
    for relative in sorted(HELD_OUT):
        text = (STDLIB / relative).read_text(encoding="utf-8")
        yield analyse(text, relative, "python")


def test_suggestions_never_collide_shadow_or_use_reserved_words(stdlib_scorer):
    reserved = reserved_words("python") | set(keyword.kwlist)
    checked = 0
    for source in held_out_sources():
        for finding in check_source(stdlib_scorer, source, flagged_only=False)[:150]:
            for suggestion in finding.suggestions:
                assert suggestion.name not in finding.variable.bound_names, (finding.name, suggestion.name)
                assert suggestion.name not in reserved
                assert suggestion.name != finding.name
                checked += 1
    assert checked > 500


def test_a_check_of_flags_only_skips_no_name_it_would_flag(stdlib_scorer):
    """`check` skips variables no judgement could flag (and, where only contradicted names are
    flagged, every name no cue contradicts); lowered thresholds show it skips no flag."""
    compared = {True: 0, False: 0}
    for contradicted_only in (True, False):
        stdlib_scorer.tables.flags_need_contradiction = contradicted_only
        try:
            for threshold in (-2.0, 0.0, 1.0):
                for source in held_out_sources():
                    every = [(f.line, f.column, f.name, [s.name for s in f.suggestions]) for f in
                             check_source(stdlib_scorer, source, threshold=threshold, flagged_only=False)
                             if f.flagged]
                    flags = [(f.line, f.column, f.name, [s.name for s in f.suggestions]) for f in
                             check_source(stdlib_scorer, source, threshold=threshold)]
                    assert flags == every
                    compared[contradicted_only] += len(flags)
        finally:
            stdlib_scorer.tables.flags_need_contradiction = True
    assert compared[False] > 20 and compared[True] >= 1, compared


def test_seeded_misname_is_flagged_and_its_name_restored(stdlib_scorer):
    """End to end on unseen real code: rename a variable wrongly; the model should notice and undo it."""
    rng = random.Random(11)
    restored, flagged_seeded, flagged_clean, seeded, clean = 0, 0, 0, 0, 0
    odd_seeded, odd_clean = [], []
    for source in held_out_sources():
        for variable in source.variables:
            if variable.name in ("self", "cls") or len(variable.occurrences) < 3:
                continue
            wrong = seed_misname(source, variable, rng)
            if wrong is None:
                continue
            renamed_source, renamed = rename(source, variable, wrong)
            line, column = (renamed_source.tokens[renamed.occurrences[0]].line,
                            renamed_source.tokens[renamed.occurrences[0]].column)
            finding, _ = suggest_at(stdlib_scorer, renamed_source, line, column)
            seeded += 1
            if variable.name in [s.name for s in finding.suggestions[:5]]:
                restored += 1
            if finding.flagged:
                flagged_seeded += 1
            clean_finding, _ = suggest_at(stdlib_scorer, source, line, column)
            clean += 1
            flagged_clean += clean_finding.flagged
            if finding.score is not None and clean_finding.score is not None:
                odd_seeded.append(finding.score)
                odd_clean.append(clean_finding.score)
    assert seeded > 200
    # Figures measured on this slice: about half restored in the top 5; seeded names look odder than the
    # true names (AUC about 0.9), and of the few flags (only contradicted names are flagged) more fall on them.
    assert restored / seeded > 0.3
    assert auc(np.array(odd_seeded), np.array(odd_clean)) > 0.8
    assert flagged_seeded > flagged_clean


def test_a_new_but_sensible_name_is_not_flagged_for_being_new(stdlib_scorer):
    text = ("def copy_tree(source_folder, target_folder):\n"
            "    for entry_name in os.listdir(source_folder):\n"
            "        source_entry = os.path.join(source_folder, entry_name)\n"
            "        target_entry = os.path.join(target_folder, entry_name)\n"
            "        shutil.copy2(source_entry, target_entry)\n")
    source = analyse(text, "new.py", "python")
    findings = check_source(stdlib_scorer, source)
    assert findings == []


def test_calibration_over_files_allows_for_clustered_flags():
    # 20 files of 500 lines; the odd-looking clean names all sit in two files.
    rng = np.random.default_rng(1)
    oddness, files = [], []
    for file_number in range(20):
        values = rng.normal(0.0, 1.0, 60)
        if file_number in (3, 11):
            values[:6] += 6.0
        oddness.extend(values)
        files.extend([file_number] * 60)
    oddness, files, lines = np.array(oddness), np.array(files), np.full(20, 500)
    from cognomen.model.training import calibrate_by_files
    plain = calibrate(oddness, int(lines.sum()), 1.0)
    robust = calibrate_by_files(oddness, files, lines, 1.0)
    assert robust > plain
    # On the sample itself, the robust threshold keeps within the budget (10 flags in 10,000 lines).
    assert (oddness > robust).sum() <= 10


def test_where_few_names_can_be_flagged_every_one_is_and_no_sample_sets_no_threshold():
    from cognomen.model.training import calibrate_by_files

    lines = np.full(20, 500)
    rare = np.array([1.5, 2.5, 0.5])  # three flaggable clean names in 10,000 lines: within a budget of 1
    assert calibrate_by_files(rare, np.array([2, 9, 15]), lines, 1.0, floor=-10.0) == -10.0
    assert calibrate_by_files(rare, np.array([2, 9, 15]), lines, 1.0) == 0.5, "without a floor, the lowest name"
    assert calibrate_by_files(np.zeros(0), np.zeros(0, int), lines, 1.0, floor=-10.0) == -10.0
    with pytest.raises(ValueError):
        calibrate_by_files(np.zeros(0), np.zeros(0, int), lines, 1.0)
    crowded = np.linspace(0.0, 5.0, 200)  # 200 flaggable names in 10,000 lines: a threshold is needed
    assert calibrate_by_files(crowded, np.arange(200) % 20, lines, 1.0, floor=-10.0) > 4.0


FILE_HABIT = '''\
def mean_reading(readings):
    glimmerwick = sum(readings)
    return glimmerwick / len(readings)


def mean_delay(delays):
    x = sum(delays)
    return x / len(delays)
'''


def test_with_no_other_name_allowed_the_detector_still_reads_numbers(stdlib_scorer):
    # A one-file repository with a background once gave every such variable gaps of -inf, the
    # detector's standardising mean NaN, and a detection AUC of 0.5.
    tables = stdlib_scorer.tables
    source = analyse("def total(values):\n    count = len(values)\n    return count\n", "t.py", "python")
    variable = next(v for v in source.variables if v.name == "count")
    [ranking] = rank_in_batches(tables, source, [variable], token_ids(source, tables.vocabulary), stdlib_scorer.weights)
    fit = name_fit(tables, ranking, "count", stdlib_scorer.weights)
    allowed = allowed_mask(tables, ranking, variable.bound_names, variable.name)
    assert allowed.any()
    with_others = detection_features(tables, ranking, allowed, fit, "count", variable)
    alone = detection_features(tables, ranking, np.zeros_like(allowed), fit, "count", variable)
    assert np.isfinite(with_others).all() and np.isfinite(alone).all()
    gaps = [FEATURE_NAMES.index(name) for name in ("combined_gap", "count_gap", "embedding_gap", "count_current_gap_top1")]
    assert (alone[gaps] == 0).all() and (with_others[gaps] != 0).any()


def test_a_name_the_file_gives_elsewhere_is_offered_with_its_place(stdlib_scorer):
    # `glimmerwick` is in no standard-library file (the team's code here): only this file backs it.
    source = analyse(FILE_HABIT, "habits.py", "python")
    finding, why = suggest_at(stdlib_scorer, source, 7, 5)
    assert why == "" and finding is not None
    names = [s.name for s in finding.suggestions]
    assert "glimmerwick" in names, names
    offered = finding.suggestions[names.index("glimmerwick")]
    assert offered.evidence == [("habits.py", 2)], "the other function's variable is the backing"


def test_single_letters_do_not_decide_the_teams_style():
    from cognomen.model.scoring import dominant_style
    # networkx names its graphs `G` and `H` tens of thousands of times (counted on networkx 3.4.2
    # with its tests): shorthand, not PascalCase. Its other locals are snake_case.
    assert dominant_style({"G": 18359.0, "H": 4000.0, "node_list": 900.0, "edge_data": 700.0}) == "snake"
    assert dominant_style({"Graph": 50.0, "NodeView": 40.0, "node_list": 10.0}) == "pascal"


def test_a_single_letter_fits_every_style():
    from cognomen.model.tokens import fits_style
    # PEP 8 asks for lower_case_with_underscores, yet `G` for a graph, `X` for a matrix are the
    # scientific Python habit (networkx, numpy's documentation): shorthand, never a style breach.
    assert fits_style("G", "snake") and fits_style("i", "camel") and fits_style("X", "pascal")
    assert not fits_style("NodeView", "snake") and not fits_style("node_view", "camel")


def test_an_editor_reuses_a_judgement_but_follows_the_file_name_it_points_at(stdlib_scorer):
    from cognomen.model.findings import JudgementCache
    cache = JudgementCache()

    def glimmerwick_evidence(text):
        source = analyse(text, "habits.py", "python")
        x = [v for v in source.variables if v.name == "x"]
        judgement = cache.judge(stdlib_scorer, source, x, None)[0]
        return next(s.evidence for s in judgement.suggestions if s.name == "glimmerwick")

    assert glimmerwick_evidence(FILE_HABIT) == [("habits.py", 2)]
    # Two lines added above the other function: `x`'s scope reads the same, so its judgement is
    # reused, but the variable its suggestion points at is now on line 4.
    assert glimmerwick_evidence("# Habits of the meter team.\n\n" + FILE_HABIT) == [("habits.py", 4)]
