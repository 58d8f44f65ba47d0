"""The folder a command learns from or reports on, checked: one-line usage errors otherwise."""

from __future__ import annotations

from pathlib import Path

from cognomen.model.corpus import Selection, Settings, discover, read_settings

from .exits import UsageError


def folder(text: str) -> Path:
    """A folder named on the command line; a usage error when it is not one."""
    path = Path(text)
    if not path.is_dir():
        raise UsageError(f"{path} is not a directory")
    return path


def repository_settings(path: Path) -> Settings:
    """The repository's own settings (cognomen.toml or pyproject.toml); a usage error when malformed."""
    try:
        return read_settings(path)
    except ValueError as error:
        raise UsageError(str(error)) from None


def source_files(path: Path) -> Selection:
    """The source files under a folder, as training picks them; a usage error when there are none."""
    selection = discover(path.resolve(), repository_settings(path))
    if not selection.files:
        raise UsageError(f"nothing to learn from: 0 source files under {path}")
    return selection
