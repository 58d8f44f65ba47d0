"""Names the team keeps on purpose: a `cognomen: keep-name` comment on a line, or `[accepted-names]`.

Honoured everywhere a name is judged (check, review, the editor); the next training learns
from them as names that fit.
"""

from __future__ import annotations

import fnmatch
import re

KEEP_MARKER = re.compile(r"(#|//|/\*|--)\s*cognomen:\s*keep-name\b")
KEEP_WORDS = "cognomen: keep-name"


def kept_lines(text: str) -> list[int]:
    """1-based numbers of the lines that carry a keep-name comment."""
    if "keep-name" not in text:
        return []
    return [number for number, line in enumerate(text.split("\n"), 1) if KEEP_MARKER.search(line)]


def is_kept(source, variable, accepted: dict[str, list[str]] | None = None) -> bool:
    """Whether a variable's binding or a use sits on a keep-name line, or its name is accepted for its path."""
    lines = source.facts.get("kept_lines")
    if lines and any(source.tokens[i].line in lines for i in variable.occurrences):
        return True
    return bool(accepted) and is_accepted(source.path, variable.name, accepted)


def is_accepted(path: str, name: str, accepted: dict[str, list[str]]) -> bool:
    return any(fnmatch.fnmatch(path, glob) and name in names for glob, names in accepted.items())


def keep_comment(comment_prefix: str) -> str:
    """What to append to a line to keep the names on it."""
    return f"  {comment_prefix} {KEEP_WORDS}" if comment_prefix != "/*" else f"  /* {KEEP_WORDS} */"
