"""The vocabulary report: Heaps' law fits, coverage on real code, files written, bad input."""

import json

import numpy as np
import pytest

from cognomen.model.vocab_report import build_report, fit_heaps

from .conftest import STDLIB, run_cli, stdlib_selection


def test_heaps_fit_recovers_known_values():
    rng = np.random.default_rng(2)
    tokens = np.geomspace(100, 1_000_000, 80)
    for k, beta in ((5.0, 0.55), (20.0, 0.7), (1.5, 0.85)):
        unique = k * tokens ** beta * np.exp(rng.normal(0, 0.02, tokens.size))
        fit = fit_heaps(tokens, unique)
        assert fit.beta == pytest.approx(beta, abs=0.01)
        assert fit.k == pytest.approx(k, rel=0.1)
        assert fit.r2 > 0.99


def test_heaps_fit_on_a_simulated_zipf_stream():
    # Tokens drawn from a Zipf distribution grow their vocabulary sublinearly (0 < beta < 1).
    rng = np.random.default_rng(4)
    stream = rng.zipf(1.6, 200_000)
    seen, points = set(), []
    for index, token in enumerate(stream, 1):
        seen.add(int(token))
        if index % 5000 == 0:
            points.append((index, len(seen)))
    points = np.array(points, dtype=float)
    fit = fit_heaps(points[:, 0], points[:, 1])
    assert 0.3 < fit.beta < 0.9 and fit.r2 > 0.95


@pytest.fixture(scope="module")
def stdlib_report():
    selection = stdlib_selection()
    return build_report(selection.root, selection.files, max_files=800)


def test_standard_library_vocabulary(stdlib_report):
    # From memory: Heaps' beta for text and code usually lies between 0.4 and 0.9.
    assert 0.4 < stdlib_report.heaps["identifiers"].beta < 0.9
    growth = stdlib_report.growth
    assert growth["subtokens"][-1][1] < growth["identifiers"][-1][1], "splitting shrinks the vocabulary"
    first = next(row for row in stdlib_report.coverage if row["n"] == 1000)
    assert first["occurrence_share"] > 0.5, "common practice: 1,000 names cover most occurrences"
    kinds = stdlib_report.kinds
    assert kinds["name"]["total"] > kinds["keyword"]["total"] > 0 and kinds["comment"]["total"] > 0


def test_report_files_and_json(tmp_path):
    out = tmp_path / "report"
    result = run_cli("vocab", str(STDLIB / "json"), "--out", str(out))
    assert result.returncode == 0, result.stderr
    data = json.loads((out / "vocabulary.json").read_text())
    text = (out / "vocabulary.md").read_text()
    assert {row["n"] for row in data["coverage"]} >= {1000, 10000, 60000}
    assert set(data["heaps"]) >= {"identifiers", "subtokens"}
    for row in data["coverage"]:
        assert {"n", "unique_share", "occurrence_share", "heldout_oov_rate"} <= set(row)
        assert f"{row['occurrence_share']:.1%}" in text
    for fit in data["heaps"].values():
        assert f"{fit['beta']:.3f}" in text
    for figures in data["kinds"].values():
        assert f"{figures['total']:,}" in text
    assert (out / "growth.png").stat().st_size > 1000 and (out / "zipf.png").stat().st_size > 1000


def test_bad_input(tmp_path):
    empty = run_cli("vocab", str(tmp_path))
    assert empty.returncode == 2 and "nothing to learn from" in empty.stderr
    missing = run_cli("vocab", str(tmp_path / "nope"))
    assert missing.returncode == 2 and "not a directory" in missing.stderr


def test_sampling_is_announced(tmp_path):
    for index in range(12):
        (tmp_path / f"m{index}.py").write_text(f"def f(value_{index}):\n    return value_{index}\n")
    result = run_cli("vocab", str(tmp_path), "--max-files", "5")
    assert result.returncode == 0 and "note: sampled 5 of 12 files" in result.stdout


def test_a_tiny_repository_reads_plainly(tmp_path):
    (tmp_path / "a.py").write_text("def f(value):\n    total = value + 1\n    return total\n")
    text = run_cli("vocab", str(tmp_path), check=True).stdout
    assert "\n1 file.\n" in text and "1 files" not in text
    assert "nan" not in text.lower()
    assert "Too few files to measure growth." in text and "too few files to measure |" in text
    # Strict JSON (the standard library's parser, told to refuse NaN): unmeasured figures are null.
    def refuse(constant):
        raise ValueError(f"{constant} is not JSON")
    report = json.loads(run_cli("vocab", "--format", "json", str(tmp_path), check=True).stdout,
                        parse_constant=refuse)
    assert report["heaps"]["identifiers"]["beta"] is None
    assert all(row["heldout_oov_rate"] is None for row in report["coverage"])
