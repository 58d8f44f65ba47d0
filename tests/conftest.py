"""Shared fixtures: real code to learn from, and models trained on it once per session."""

from __future__ import annotations

import ast
import shutil
import signal
import subprocess
import sys
import sysconfig
from pathlib import Path

import pytest

from cognomen.model import bundle
from cognomen.model.corpus import Settings, TokenCache, discover, load_corpus
from cognomen.model.persistence import load_scorer, save
from cognomen.model.pipeline import STDLIB_EXCLUDES
from cognomen.model.training import TrainSettings, train

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_workspace"
FIXTURES = Path(__file__).resolve().parent / "fixtures"
# The standard library of the running Python: real third-party code every machine has.
STDLIB = Path(sysconfig.get_paths()["stdlib"])


def stdlib_selection():
    return discover(STDLIB, Settings(exclude=STDLIB_EXCLUDES))


@pytest.fixture(scope="session")
def stdlib_corpus(tmp_path_factory):
    """The whole standard library, lexed once (test folders excluded)."""
    cache = tmp_path_factory.mktemp("stdlib-cache")
    return load_corpus(stdlib_selection(), TokenCache(cache))


@pytest.fixture(scope="session")
def stdlib_store(tmp_path_factory, stdlib_corpus):
    """A model store trained on the standard library except a few held-out modules."""
    store = tmp_path_factory.mktemp("stdlib-store")
    held_out = {path for path in (f.path for f in stdlib_corpus.files) if path in HELD_OUT}
    from cognomen.model.corpus import Corpus
    training = Corpus([f for f in stdlib_corpus.files if f.path not in held_out], {})
    trained = train(training, TrainSettings(epochs=3))
    directory = save(store, trained, {"source_commit": None})
    bundle.promote(store, directory.name)
    return store


# Modules the session model never sees, for end-to-end checks on unseen real code.
HELD_OUT = {"shutil.py", "tarfile.py", "zipfile.py", "configparser.py", "csv.py"}


@pytest.fixture(scope="session")
def stdlib_scorer(stdlib_store):
    scorer, _ = load_scorer(stdlib_store)
    return scorer


@pytest.fixture()
def any_odd_scorer(stdlib_scorer):
    """The session model as `train --flag-any-odd-name` would make it: any name may be flagged, not only
    names a collection's naming contradicts (for tests that need flags; pass a threshold)."""
    stdlib_scorer.tables.flags_need_contradiction = False
    yield stdlib_scorer
    stdlib_scorer.tables.flags_need_contradiction = True


def ctrl_c_as_in_a_terminal() -> None:
    """A child's Ctrl-C as a terminal leaves it (a `preexec_fn`): a test run started in the
    background (`nohup make test &`) would otherwise pass on an ignored SIGINT."""
    signal.signal(signal.SIGINT, signal.SIG_DFL)


def run_cli(*args: str, cwd: Path | None = None, check: bool = False, input_text: str | None = None,
            timeout: float = 600) -> subprocess.CompletedProcess:
    """The real command line in a subprocess, as a person or CI would run it."""
    result = subprocess.run([sys.executable, "-m", "cognomen", *args], cwd=cwd, capture_output=True, text=True,
                            timeout=timeout, input=input_text)
    if check and result.returncode != 0:
        raise AssertionError(f"cognomen {' '.join(args)} exited {result.returncode}:\n{result.stderr}")
    return result


@pytest.fixture(scope="session")
def demo_copy(tmp_path_factory):
    """A git repository holding a copy of the demo workspace, with a trained model."""
    target = tmp_path_factory.mktemp("demo") / "fernhill"
    shutil.copytree(DEMO, target, ignore=shutil.ignore_patterns(".cognomen", "__pycache__", "changes"))
    git(target, "init", "-q", "-b", "main")
    git(target, "add", "-A")
    git(target, "commit", "-q", "-m", "Fernhill controller and dashboard")
    run_cli("train", "--quiet", "--reproducible", "--flag-budget", "3", str(target),
            check=True)
    return target


@pytest.fixture()
def workspace(demo_copy, tmp_path):
    """A private copy of the trained demo repository per test, free to change."""
    target = tmp_path / "fernhill"
    shutil.copytree(demo_copy, target, symlinks=True)
    return target


# The demo's prepared change: it plants odd names the model (trained on the code before it) never saw, the
# clearest a valve called `zone` at fernhill/valves.py:123:9 (the team calls it `valve`).
ODD_NAMES_PATCH = DEMO / "changes" / "odd-names.patch"


def apply_odd_names(repo: Path, *paths: str) -> None:
    """Apply the prepared change with git, uncommitted (only its parts for `paths`, when given)."""
    git(repo, "apply", *(f"--include={path}" for path in paths), str(ODD_NAMES_PATCH))


@pytest.fixture(scope="session")
def patched_demo(demo_copy, tmp_path_factory):
    """A private copy of the trained demo with the prepared change applied, the review situation: the model is
    the one trained before the change. Tests only read it; `patched_workspace` is the copy to change."""
    target = tmp_path_factory.mktemp("patched") / "fernhill"
    shutil.copytree(demo_copy, target, symlinks=True)
    apply_odd_names(target)
    return target


@pytest.fixture()
def patched_workspace(patched_demo, tmp_path):
    """A private copy of the patched demo per test, free to change."""
    target = tmp_path / "fernhill"
    shutil.copytree(patched_demo, target, symlinks=True)
    return target


def variable_places(text: str, name: str, function: str) -> list[tuple[int, int]]:
    """Every place (1-based line and column) Python's own ast finds the variable `name` in `function`."""
    tree = ast.parse(text)
    node = next(n for n in ast.walk(tree) if isinstance(n, ast.FunctionDef) and n.name == function)
    return sorted((n.lineno, n.col_offset + 1) for n in ast.walk(node) if isinstance(n, ast.Name) and n.id == name)


def renamed_by_ast(text: str, name: str, new_name: str, function: str) -> str:
    """`text` with the variable `name` in `function` renamed at the places Python's ast finds (ASCII lines)."""
    lines = text.split("\n")
    for line, column in reversed(variable_places(text, name, function)):
        row = lines[line - 1]
        assert row[column - 1:column - 1 + len(name)] == name
        lines[line - 1] = row[:column - 1] + new_name + row[column - 1 + len(name):]
    return "\n".join(lines)


def git(cwd: Path, *args: str) -> str:
    result = subprocess.run(["git", "-c", "user.name=Test", "-c", "user.email=test@example.invalid", *args],
                            cwd=cwd, capture_output=True, text=True, check=True)
    return result.stdout
