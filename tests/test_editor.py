"""A real editor: Neovim (Debian's 0.7.2) headless, with cognomen as its language server."""

import os
import shutil
import subprocess
import sys

import pytest

from .conftest import FIXTURES

NVIM = shutil.which("nvim")


@pytest.mark.skipif(NVIM is None, reason="Neovim is not installed (apt-get install -y neovim)")
def test_neovim_shows_the_hint_and_applies_the_quick_fix(demo_copy, tmp_path):
    workspace = tmp_path / "fernhill"
    shutil.copytree(demo_copy, workspace, symlinks=True)
    out = tmp_path / "buffer.txt"
    environment = dict(os.environ, COGNOMEN_ROOT=str(workspace), COGNOMEN_FILE=str(workspace / "fernhill/alerts.py"),
                       COGNOMEN_OUT=str(out), COGNOMEN_PYTHON=sys.executable)
    result = subprocess.run([NVIM, "--headless", "-u", "NONE", "-i", "NONE", "-n", "-c",
                             f"luafile {FIXTURES / 'neovim' / 'driver.lua'}"],
                            env=environment, capture_output=True, text=True, timeout=180, stdin=subprocess.DEVNULL)
    lines = out.read_text().splitlines() if out.exists() else []
    assert result.returncode == 0, (lines[:2], result.stderr[-2000:])
    assert lines[0].startswith("DIAGNOSTIC `valve` does not fit how it is used here")
    assert lines[1] == "ACTION Rename `valve` to `zone`"
    buffer = "\n".join(lines[2:])
    assert "        zone = registry.get(zone_id)" in buffer
    assert "deficit = zone.target_moisture - moisture" in buffer
    assert "valve" not in buffer.split("def dry_zone_alerts")[1].split("def stale_sensor_alerts")[0]
    assert (workspace / "fernhill/alerts.py").read_text().count("valve = registry.get") == 1, \
        "the file on disk is untouched until the person saves"
