"""`cognomen review`: flag only the odd names a change introduced or touched."""

from __future__ import annotations

import json
import math
import re
import subprocess
from dataclasses import dataclass, field
from pathlib import Path

from cognomen.model.corpus import SkipFile, decode_source, read_settings
from cognomen.model.findings import CLEAREST_MARGIN, Finding, analyse_text, check_source
from cognomen.model.languages import language_for_path
from cognomen.model.scoring import Scorer

LEVELS = ("warning", "error")
STRONG_MARGIN = CLEAREST_MARGIN  # oddness this far above the calibrated threshold makes an error rather than a warning


class ReviewError(Exception):
    """Bad revisions, not a repository, and the like: one line, exit 2."""


@dataclass
class ChangedFile:
    path: str
    added_lines: set[int] | None  # None: the whole file is new
    text: str

    def touches(self, line: int) -> bool:
        return self.added_lines is None or line in self.added_lines


@dataclass
class ReviewResult:
    findings: list[Finding] = field(default_factory=list)
    suppressed: int = 0
    files: int = 0
    skipped: dict[str, int] = field(default_factory=dict)
    scorer: Scorer | None = None  # the model whose own thresholds decide each finding's level

    def level(self, finding: Finding) -> str:
        return level_of(finding, calibrated_threshold(self.scorer, finding))

    def skip(self, reason: str) -> None:
        self.skipped[reason] = self.skipped.get(reason, 0) + 1


def calibrated_threshold(scorer: Scorer | None, finding: Finding) -> float:
    """The model's own threshold for a finding, before any override: what decides its level."""
    return scorer.threshold_for(finding.language) if scorer is not None else math.inf


STRONG_AGREEMENT = 0.8  # a contradicting cue where this share of the team's names agree makes an error


def level_of(finding: Finding, calibrated: float) -> str:
    """Error when the team's naming at the contradicting cue is near unanimous (STRONG_AGREEMENT), or,
    for a model that flags by oddness alone, when the oddness is STRONG_MARGIN above the model's
    calibrated threshold; else warning.

    A threshold given on the command line or in the editor changes which names are reported,
    never how severe a name is.
    """
    if finding.agreement is not None:
        return "error" if finding.agreement >= STRONG_AGREEMENT else "warning"
    if finding.score is not None and finding.score >= calibrated + STRONG_MARGIN:
        return "error"
    return "warning"


def git(root: Path, *args: str) -> str:
    try:
        result = subprocess.run(["git", *args], cwd=root, capture_output=True, timeout=120)
    except (OSError, subprocess.TimeoutExpired) as error:
        raise ReviewError(f"git did not answer ({error})") from None
    if result.returncode != 0:
        message = result.stderr.decode("utf-8", "replace").strip().splitlines()
        raise ReviewError(message[-1] if message else f"git {' '.join(args)} failed")
    return result.stdout.decode("utf-8", "surrogateescape")


def repository_top(start: Path) -> Path:
    try:
        return Path(git(start, "rev-parse", "--show-toplevel").strip())
    except ReviewError:
        raise ReviewError(f"{start.resolve()} is not inside a git repository") from None


def verify_revision(root: Path, revision: str) -> None:
    try:
        git(root, "rev-parse", "--verify", "--quiet", f"{revision}^{{commit}}")
    except ReviewError:
        raise ReviewError(f"unknown revision {revision}") from None


_HUNK = re.compile(r"^@@ -\d+(?:,\d+)? \+(\d+)(?:,(\d+))? @@")


def parse_diff(diff: str) -> dict[str, set[int]]:
    """Added or changed line numbers per new path from a zero-context unified diff."""
    changed: dict[str, set[int]] = {}
    path = None
    for line in diff.splitlines():
        if line.startswith("+++ "):
            target = line[4:]
            path = None if target == "/dev/null" else (target[2:] if target.startswith("b/") else target)
            if path is not None:
                changed.setdefault(path, set())
        elif line.startswith("@@") and path is not None:
            match = _HUNK.match(line)
            if match:
                start, count = int(match.group(1)), int(match.group(2) or "1")
                changed[path].update(range(start, start + count))
    return changed


def changed_files(root: Path, base: str, head: str | None, result: ReviewResult) -> list[ChangedFile]:
    """The files a change touched, as they are in head (or in the working tree), with their added lines."""
    verify_revision(root, base)
    if head is not None:
        verify_revision(root, head)
        diff = git(root, "diff", "--unified=0", "--no-color", "--no-ext-diff", "--find-renames", f"{base}...{head}")
    else:
        diff = git(root, "diff", "--unified=0", "--no-color", "--no-ext-diff", "--find-renames", base)
    lines_by_path: dict[str, set[int] | None] = dict(parse_diff(diff))
    if head is None:
        untracked = git(root, "ls-files", "--others", "--exclude-standard", "-z").split("\0")
        for path in filter(None, untracked):
            if not path.startswith(".cognomen/"):
                lines_by_path[path] = None
    files = []
    for path, added in sorted(lines_by_path.items()):
        if added is not None and not added:
            continue
        if language_for_path(path.rsplit("/", 1)[-1]) is None:
            continue
        try:
            if head is None:
                data = (root / path).read_bytes()
            else:
                data = subprocess.run(["git", "show", f"{head}:{path}"], cwd=root, capture_output=True,
                                      timeout=60, check=True).stdout
            text = decode_source(data)
        except (OSError, subprocess.SubprocessError):
            result.skip("unreadable")
            continue
        except SkipFile as skip:
            result.skip(str(skip))
            continue
        files.append(ChangedFile(path, added, text))
    return files


def accepted_names(root: Path) -> dict[str, list[str]]:
    try:
        return read_settings(root).accepted_names
    except ValueError as error:
        raise ReviewError(str(error)) from None


def review(scorer: Scorer, root: Path, base: str, head: str | None = None,
           threshold: float | None = None) -> ReviewResult:
    """Findings whose binding or a use sits on a line the change added or changed."""
    result = ReviewResult(scorer=scorer)
    accepted = accepted_names(root)
    for changed in changed_files(root, base, head, result):
        source = analyse_text(changed.text, changed.path)
        if source is None:
            continue
        result.files += 1
        kept: list[Finding] = []
        for finding in check_source(scorer, source, threshold, accepted=accepted, kept=kept):
            if any(changed.touches(line) for line, _ in finding.occurrences):
                result.findings.append(finding)
        result.suppressed += sum(1 for finding in kept if any(changed.touches(line) for line, _ in finding.occurrences))
    return result


def fails(result: ReviewResult, fail_on: str) -> bool:
    if fail_on == "never":
        return False
    minimum = LEVELS.index(fail_on)
    return any(LEVELS.index(result.level(f)) >= minimum for f in result.findings)


def to_json(result: ReviewResult) -> str:
    return json.dumps({"findings": [dict(f.to_json(), level=result.level(f)) for f in result.findings],
                       "suppressed": result.suppressed, "files": result.files}, indent=2)
