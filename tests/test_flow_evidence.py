"""A suggestion that the variable's flow backs says why, and its evidence is a real place in the
team's code where that flow happens (the demo repository, through the real command line)."""

import json
import shutil
import subprocess

from .conftest import DEMO, run_cli


def test_flow_backed_suggestion_points_at_a_real_call(demo_copy, tmp_path):
    repo = tmp_path / "fernhill"
    shutil.copytree(demo_copy, repo, symlinks=True)
    subprocess.run(["git", "apply", str(DEMO / "changes" / "odd-names.patch")], cwd=repo, check=True)
    # `flag = average_moisture(zone_readings)` in the prepared change.
    result = run_cli("suggest", "--format", "json", "fernhill/readings.py:157:9", cwd=repo)
    assert result.returncode == 0, result.stderr
    entry = json.loads(result.stdout)["results"][0]
    assert entry["name"] == "flag"
    backed = [s for s in entry["suggestions"] if "average_moisture" in s.get("why", "")]
    assert backed, entry["suggestions"]
    suggestion = backed[0]
    assert suggestion["name"] == "moisture"
    assert suggestion["evidence"], "the flow's own places back it"
    for place in suggestion["evidence"][:1]:
        line = (repo / place["path"]).read_text(encoding="utf-8").split("\n")[place["line"] - 1]
        assert "average_moisture(" in line and "moisture" in line.split("=")[0], line
