"""Findings for whole files and suggestions at positions: what `check`, `suggest` and the editor show."""

from __future__ import annotations

import bisect
import dataclasses
import hashlib
import math
import re
from dataclasses import dataclass, field

import numpy as np

from .chunks import PieceCache
from .corpus import SourceFile, analyse
from .scopes import Variable
from .suppression import is_kept
from .scoring import (IGNORED_NAMES, MIN_FLAGGED_LENGTH, FileNames, Judgement, Scorer, Suggestion, allowed_mask,
                      rank_candidates, token_ids)
from .languages import get_language, language_for_path


@dataclass
class Finding:
    """A variable, where it is bound, how odd its name is and what the team would call it."""

    path: str
    line: int
    column: int
    end_line: int
    end_column: int
    name: str
    score: float | None
    threshold: float
    flagged: bool
    suggestions: list[Suggestion]
    variable: Variable = field(repr=False)
    occurrences: list[tuple[int, int]] = field(default_factory=list)  # (line, column) of every use
    shorthand: dict[tuple[int, int], str] = field(default_factory=dict)  # uses that also name a property
    language: str = ""
    dictated: str = ""  # why the name is never flagged (an override's parameter...), or ""
    agreement: float | None = None  # a flag a cue contradicts: the team's share there of the name it gives

    def rename_edits(self, new_name: str) -> list[tuple[int, int, int, str]]:
        """(line, column, length, new text) for every use: a rename that changes the uses and nothing else."""
        return [(line, column, len(self.name), self.shorthand[(line, column)].format(new_name)
                 if (line, column) in self.shorthand else new_name) for line, column in self.occurrences]

    def to_json(self) -> dict:
        return {
            "path": self.path, "line": self.line, "column": self.column, "end_line": self.end_line,
            "end_column": self.end_column, "name": self.name,
            "score": None if self.score is None else round(self.score, 4),
            "threshold": round(self.threshold, 4) if math.isfinite(self.threshold) else None,
            "suggestions": [suggestion_json(s) for s in self.suggestions],
            **({"agreement": round(self.agreement, 4)} if self.agreement is not None else {}),
        }


def suggestion_json(suggestion: Suggestion) -> dict:
    found = {"name": suggestion.name, "score": round(suggestion.score, 4),
             "evidence": [{"path": path, "line": line} for path, line in suggestion.evidence]}
    if suggestion.reason:
        found["why"] = suggestion.reason
    return found


# A public parameter is part of a function's interface (callers may name it): it is flagged only
# this far above the threshold, the clearest cases, where review also reports an error.
CLEAREST_MARGIN = 2.0


def _finding(source: SourceFile, judgement: Judgement, scorer: Scorer, threshold: float) -> Finding:
    variable = judgement.variable
    first = source.tokens[variable.occurrences[0]]
    places = [(source.tokens[i].line, source.tokens[i].column) for i in variable.occurrences]
    shorthand = {}
    if variable.shorthand:
        # `{timeout}` keeps its property's name: a rename writes `timeout: {new name}` there.
        pattern = get_language(source.language).shorthand_rename(variable.name, "{}")
        shorthand = {(source.tokens[i].line, source.tokens[i].column): pattern for i in variable.shorthand}
    # Shorthand (`b`, `s`) is never offered in place of a word: every such suggestion loses meaning.
    suggestions = [s for s in judgement.suggestions
                   if len(s.name) >= MIN_FLAGGED_LENGTH or len(variable.name) < MIN_FLAGGED_LENGTH]
    flagged = scorer.is_flagged(judgement, threshold + (CLEAREST_MARGIN if variable.public_parameter else 0.0))
    return Finding(
        path=source.path, line=first.line, column=first.column, end_line=first.line,
        end_column=first.column + len(variable.name), name=variable.name, score=judgement.oddness,
        threshold=threshold, flagged=flagged and bool(suggestions),
        suggestions=suggestions, variable=variable, occurrences=places, shorthand=shorthand,
        language=source.language, dictated=judgement.dictated, agreement=judgement.agreement,
    )


def analyse_text(text: str, path: str, language: str | None = None,
                 pieces: PieceCache | None = None) -> SourceFile | None:
    """Lex and scope a document (reusing `pieces` of earlier readings); None for an unsupported language."""
    language = language or language_for_path(path.rsplit("/", 1)[-1])
    if language is None:
        return None
    # The content hash tells the model whether it learned from this very text.
    digest = hashlib.sha256(text.encode("utf-8", "surrogateescape")).hexdigest()
    return analyse(text, path, language, digest, pieces=pieces)


def check_source(scorer: Scorer, source: SourceFile, threshold: float | None = None,
                 flagged_only: bool = True, cache: "JudgementCache | None" = None,
                 accepted: dict[str, list[str]] | None = None, kept: list | None = None) -> list[Finding]:
    """Every variable whose name does not fit its use (or every judged variable, if asked).

    Names kept on purpose (a keep-name comment, `accepted`) are never flagged; flags they
    would have had go to `kept` when a list is given.
    """
    limit = scorer.threshold_for(source.language, threshold)
    findings = []
    variables = [v for v in source.variables if v.name not in IGNORED_NAMES]
    if flagged_only:
        variables = scorer.contradicted_only(source, [v for v in variables if scorer.may_be_flagged(source, v)])
    suggest_above = limit if flagged_only else None
    if cache is not None:
        judgements = cache.judge(scorer, source, variables, suggest_above)
    else:
        judgements = scorer.judge_many(source, variables, suggest_above=suggest_above)
    for judgement in judgements:
        finding = _finding(source, judgement, scorer, limit)
        if finding.flagged and is_kept(source, judgement.variable, accepted):
            finding.flagged = False
            if kept is not None:
                kept.append(finding)
            if flagged_only:
                continue
        if finding.flagged or not flagged_only:
            findings.append(finding)
    return findings


def _moved_in_file(source: SourceFile, judgements: list[Judgement]) -> list[Judgement]:
    """Reused judgements with their same-file evidence where it is now: an edit above another
    function moves the variable a suggestion points at, not the judged scope."""
    names = None
    refreshed = []
    for judgement in judgements:
        if any(s.in_file for s in judgement.suggestions):
            names = names or FileNames(source)
            suggestions = [dataclasses.replace(s, evidence=[(source.path, names.lines[s.name])])
                           if s.in_file and s.name in names.lines else s
                           for s in judgement.suggestions if not s.in_file or s.name in names.lines]
            judgement = dataclasses.replace(judgement, suggestions=suggestions)
        refreshed.append(judgement)
    return refreshed


class JudgementCache:
    """Judgements of variables whose whole scope is unchanged, reused while a document is edited.

    A variable is looked up by its name, kind, the text of its scope, where in that scope it
    occurs and what else is bound there, so an edit elsewhere in the file costs no scoring.
    """

    def __init__(self) -> None:
        self.entries: dict[tuple, tuple] = {}
        self.owner: tuple | None = None

    def judge(self, scorer: Scorer, source: SourceFile, variables: list[Variable],
              suggest_above: float | None) -> list[Judgement]:
        owner = (id(scorer), suggest_above)
        if owner != self.owner:
            self.entries, self.owner = {}, owner
        lines = [t.line for t in source.tokens]
        spans: dict[tuple[int, int], tuple[int, int]] = {}
        keys = [self._key(source, lines, spans, v) for v in variables]
        missing = [(v, k) for v, k in zip(variables, keys) if k not in self.entries]
        if missing:
            fresh = scorer.judge_many(source, [v for v, _ in missing], suggest_above=suggest_above)
            for (_, key), judgement in zip(missing, fresh):
                self.entries[key] = (judgement.oddness, judgement.suggestions, judgement.features,
                                     judgement.dictated, judgement.flaggable, judgement.agreement)
        self.entries = {key: self.entries[key] for key in keys}
        judgements = [Judgement(v, *self.entries[k]) for v, k in zip(variables, keys)]
        if len(missing) < len(variables):
            judgements = _moved_in_file(source, judgements)
        return judgements

    @staticmethod
    def _key(source: SourceFile, lines: list[int], spans: dict, variable: Variable) -> tuple:
        scope = (variable.scope_start, variable.scope_end)
        if scope not in spans:
            first = bisect.bisect_left(lines, scope[0])
            last = bisect.bisect_right(lines, scope[1])
            # The context windows reach a few tokens past the scope; include them in the text.
            first, last = max(0, first - 8), min(len(source.tokens), last + 8)
            spans[scope] = (first, hash(tuple(t.text for t in source.tokens[first:last])))
        first, text = spans[scope]
        return (variable.name, variable.kind, text, tuple(i - first for i in variable.occurrences),
                hash(variable.bound_names))


def variable_at(source: SourceFile, line: int, column: int) -> Variable | None:
    """The variable with an occurrence covering a 1-based line and character column."""
    for variable in source.variables:
        for index in variable.occurrences:
            token = source.tokens[index]
            if token.line == line and token.column <= column <= token.column + len(token.text):
                return variable
    return None


def suggest_at(scorer: Scorer, source: SourceFile, line: int, column: int,
               threshold: float | None = None) -> tuple[Finding | None, str]:
    """Ranked names for the variable at a position, or None and the reason there are none."""
    variable = variable_at(source, line, column)
    if variable is None:
        return None, "no local variable or parameter at this position"
    if variable.name in IGNORED_NAMES:
        return None, f"`{variable.name}` is not a name cognomen judges"
    judgement = scorer.judge(source, variable)
    limit = scorer.threshold_for(source.language, threshold)
    finding = _finding(source, judgement, scorer, limit)
    if not finding.suggestions:
        return finding, "the model knows no names for this language yet"
    return finding, ""


HOLE = "cognomen_new_name"
_IDENTIFIER_END = re.compile(r"[A-Za-z_$][A-Za-z0-9_$]*$")
_IDENTIFIER_START = re.compile(r"^[A-Za-z0-9_$]*")
def complete_binding(scorer: Scorer, text: str, path: str, line: int, column: int,
                     language: str | None = None, limit: int = 10,
                     pieces: PieceCache | None = None) -> list[Suggestion] | None:
    """Names for a variable being bound at a position, ranked by the code around it.

    None when the position is not where a new variable is named (an assignment target,
    parameter or loop target in Python; let/const/var in JavaScript and TypeScript; Go).
    """
    language = language or language_for_path(path.rsplit("/", 1)[-1])
    lines = text.split("\n")
    patterns = get_language(language).binding_before if language else ()
    if not patterns or not 0 < line <= len(lines):
        return None
    current = lines[line - 1]
    before, after = current[: column - 1], current[column - 1:]
    typed = _IDENTIFIER_END.search(before)
    prefix = typed.group(0) if typed else ""
    head = before[: len(before) - len(prefix)]
    if not any(pattern.search(head) for pattern in patterns):
        return None
    rest = _IDENTIFIER_START.match(after).group(0)
    lines[line - 1] = head + HOLE + after[len(rest):]
    source = analyse("\n".join(lines), path, language, pieces=pieces)
    variable = next((v for v in source.variables if v.name == HOLE), None)
    if variable is None:
        indices = [i for i, t in enumerate(source.tokens) if t.text == HOLE]
        if not indices:
            return None
        names = frozenset(t.text for t in source.tokens if t.kind == "name")
        variable = Variable(HOLE, "local", indices, line, line, bound_names=names)
    ranking = rank_candidates(scorer.tables, source, variable, token_ids(source, scorer.tables.vocabulary),
                              scorer.weights)
    if ranking is None:
        return []
    # Names used later in this scope but not bound before the cursor are what is being bound now.
    hole = variable.occurrences[0]
    later = {v.name for v in source.variables if v.name != HOLE and v.occurrences[0] > hole
             and v.scope_start <= line <= v.scope_end}
    allowed = allowed_mask(scorer.tables, ranking, variable.bound_names - later - {HOLE}, HOLE)
    if prefix:
        allowed &= np.array([scorer.tables.names[r].lower().startswith(prefix.lower()) for r in ranking.rows], dtype=bool)
    if later:
        boost = np.array([scorer.tables.names[r] in later for r in ranking.rows], dtype=bool)
        ranking.combined = np.where(boost, ranking.combined + 100.0, ranking.combined)
    lowered = prefix.lower()
    found = scorer.suggestions(ranking, allowed, limit * 3, variable.bound_names - later, HOLE)
    return [s for s in found if s.name.lower().startswith(lowered)][:limit]
