"""Real editors headless, with cognomen as their language server: Neovim (Debian's 0.7.2) and
Emacs with eglot (Debian's emacs-nox 28 and elpa-eglot 1.9)."""

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from .conftest import FIXTURES, ROOT, renamed_by_ast

NVIM = shutil.which("nvim")
EMACS = shutil.which("emacs")
DEBIAN_EGLOT = list(Path("/usr/share/emacs/site-lisp/elpa").glob("eglot-*"))


def assert_renamed_in_the_buffer_only(buffer: str, workspace: Path) -> None:
    """`zone` became `valve` in the editor's buffer at every place Python's ast finds the variable, and nowhere
    else; the file on disk is as it was."""
    on_disk = (workspace / "fernhill/valves.py").read_text()
    assert buffer.rstrip("\n") == renamed_by_ast(on_disk, "zone", "valve", "busiest_valve").rstrip("\n")
    assert "    for valve in bank.open_valves():" in buffer and "            busiest = valve" in buffer
    assert "    for zone in bank.open_valves():" in on_disk, "the file on disk is untouched until the person saves"


@pytest.mark.skipif(NVIM is None, reason="Neovim is not installed (apt-get install -y neovim)")
def test_neovim_shows_the_hint_and_applies_the_quick_fix(patched_workspace, tmp_path):
    workspace = patched_workspace
    out = tmp_path / "buffer.txt"
    environment = dict(os.environ, COGNOMEN_ROOT=str(workspace), COGNOMEN_FILE=str(workspace / "fernhill/valves.py"),
                       COGNOMEN_OUT=str(out), COGNOMEN_PYTHON=sys.executable)
    result = subprocess.run([NVIM, "--headless", "-u", "NONE", "-i", "NONE", "-n", "-c",
                             f"luafile {FIXTURES / 'neovim' / 'driver.lua'}"],
                            env=environment, capture_output=True, text=True, timeout=180, stdin=subprocess.DEVNULL)
    lines = out.read_text().splitlines() if out.exists() else []
    assert result.returncode == 0, (lines[:2], result.stderr[-2000:])
    assert lines[0].startswith("DIAGNOSTIC `zone` does not fit how it is used here")
    assert lines[1] == "ACTION Rename `zone` to `valve`"
    assert_renamed_in_the_buffer_only("\n".join(lines[2:]), workspace)


def readme_eglot_setup() -> str:
    """The README's Emacs snippet, word for word: the test runs what a person would paste."""
    block = re.search(r"```elisp\n(.*?)```", (ROOT / "README.md").read_text(), re.DOTALL)
    assert block, "the README has an Emacs snippet"
    return block.group(1)


@pytest.mark.skipif(EMACS is None or not DEBIAN_EGLOT,
                    reason="Emacs with eglot is not installed (apt-get install -y emacs-nox elpa-eglot)")
def test_emacs_eglot_shows_the_hint_and_applies_the_quick_fix(patched_workspace, tmp_path):
    workspace = patched_workspace
    setup = tmp_path / "init.el"
    setup.write_text(readme_eglot_setup())
    out = tmp_path / "buffer.txt"
    # The README says cognomen must be on Emacs's PATH: put this installation's scripts there.
    path = os.pathsep.join([str(Path(sys.executable).parent), os.environ.get("PATH", "")])
    environment = dict(os.environ, PATH=path, HOME=str(tmp_path), COGNOMEN_SETUP=str(setup),
                       COGNOMEN_FILE=str(workspace / "fernhill/valves.py"), COGNOMEN_OUT=str(out))
    result = subprocess.run([EMACS, "--batch", "-Q", "-l", str(FIXTURES / "emacs" / "driver.el")],
                            env=environment, cwd=workspace, capture_output=True, text=True, timeout=180,
                            input="\n")  # RET at the code-action menu takes the default (preferred) fix
    lines = out.read_text().splitlines() if out.exists() else []
    assert result.returncode == 0, (lines[:3], result.stderr[-3000:])
    assert lines[0].startswith("DIAGNOSTIC cognomen [name-does-not-fit]: `zone` does not fit how it is used here")
    # eglot 1.9 without markdown-mode declares plain text only: the hover reads plainly.
    assert lines[1].startswith("HOVER plaintext zone does not fit how it is used here (oddness ")
    assert "`" not in lines[1]
    assert lines[2] == "ACTION Rename `zone` to `valve`"
    assert_renamed_in_the_buffer_only("\n".join(lines[3:]), workspace)


def test_the_readme_emacs_setup_covers_what_the_neovim_one_does():
    readme = (ROOT / "README.md").read_text()
    filetypes = re.findall(r'"(\w+)"', re.search(r"pattern = \{([^}]*)\}", readme).group(1))
    modes = set(re.findall(r"[\w+-]+-mode", readme_eglot_setup()))
    emacs_mode = {"python": "python", "javascript": "js", "typescript": "typescript", "go": "go", "java": "java",
                  "rust": "rust", "c": "c", "cpp": "c++", "cs": "csharp"}
    for filetype in filetypes:
        assert f"{emacs_mode[filetype]}-mode" in modes, filetype
        assert f"{emacs_mode[filetype]}-ts-mode" in modes, filetype  # Emacs 29's tree-sitter modes
    assert "tsx-ts-mode" in modes
    assert "must be on the `PATH` Emacs starts with" in readme
