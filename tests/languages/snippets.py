"""Helpers for the per-language tests: hand-worked snippets in, variables and renamed text out,
and the language's own compiler or interpreter as the judge of whether a rename kept the program."""

from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

from cognomen.model.corpus import analyse
from cognomen.model.findings import _finding
from cognomen.model.scoring import Judgement


def variables(text: str, language: str) -> dict[str, tuple[str, list[tuple[int, int]]]]:
    """name -> (kind, [(line, column) of every occurrence]) for a snippet with one variable per name."""
    source = analyse(text, "snippet", language)
    found = {}
    for variable in source.variables:
        assert variable.name not in found, f"{variable.name} is bound twice in the snippet; use the list form"
        found[variable.name] = (variable.kind, [(source.tokens[i].line, source.tokens[i].column)
                                                for i in variable.occurrences])
    return found


def cues(text: str, path: str, language: str) -> dict[str, set[str]]:
    """name -> the name-flow cues of the variable so called, for a snippet with one variable per name."""
    return {v.name: set(v.cues) for v in analyse(text, path, language).variables}


def variable_list(text: str, language: str) -> list[tuple[str, str, list[tuple[int, int]]]]:
    source = analyse(text, "snippet", language)
    return [(v.name, v.kind, [(source.tokens[i].line, source.tokens[i].column) for i in v.occurrences])
            for v in source.variables]


def rename(text: str, language: str, renames: dict[str, str] | None = None) -> str:
    """The snippet with variables renamed through the edits the editor's quick fix sends.

    Without `renames`, every variable gets a fresh name of its own (`name_r3`).
    """
    source = analyse(text, "snippet", language)
    edits = []
    for number, variable in enumerate(source.variables):
        if renames is not None and variable.name not in renames:
            continue
        new_name = renames[variable.name] if renames is not None else f"{variable.name}_r{number}"
        finding = _finding(source, Judgement(variable, None, []), _NoScorer(), 0.0)
        edits.extend(finding.rename_edits(new_name))
    lines = text.split("\n")
    for line, column, length, new_text in sorted(edits, reverse=True):
        current = lines[line - 1]
        lines[line - 1] = current[:column - 1] + new_text + current[column - 1 + length:]
    return "\n".join(lines)


class _NoScorer:
    def is_flagged(self, judgement, threshold):
        return False


def run(language: str, text: str, directory: Path) -> str:
    """The program's output, built and run by the language's own toolchain (skipped when missing)."""
    directory.mkdir(parents=True, exist_ok=True)
    if language == "python":
        import sys
        command = [sys.executable, _write(directory / "snippet.py", text)]
    elif language == "javascript":
        command = [_tool("node"), _write(directory / "snippet.js", text)]
    elif language == "java":
        command = [_tool("java"), _write(directory / "Snippet.java", text)]  # single-file launch, JDK 11+
    elif language in ("c", "cpp", "rust"):
        compiler = {"c": "gcc", "cpp": "g++", "rust": "rustc"}[language]
        source = _write(directory / f"snippet.{ {'c': 'c', 'cpp': 'cpp', 'rust': 'rs'}[language] }", text)
        binary = str(directory / "snippet")
        built = subprocess.run([_tool(compiler), source, "-o", binary], capture_output=True, text=True, timeout=120)
        assert built.returncode == 0, built.stderr[-3000:]
        command = [binary]
    else:
        pytest.skip(f"no toolchain for {language} here")
    result = subprocess.run(command, capture_output=True, text=True, timeout=120, cwd=directory)
    assert result.returncode == 0, result.stderr[-3000:]
    return result.stdout


def _write(path: Path, text: str) -> str:
    path.write_text(text, encoding="utf-8")
    return str(path)


def _tool(name: str) -> str:
    found = shutil.which(name)
    if found is None:
        pytest.skip(f"{name} is not installed")
    return found
