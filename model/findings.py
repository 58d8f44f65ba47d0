"""Findings for whole files and suggestions at positions: what `check`, `suggest` and the editor show."""

from __future__ import annotations

from dataclasses import dataclass, field

from .corpus import SourceFile, analyse
from .scopes import Variable
from .scoring import IGNORED_NAMES, Judgement, Scorer, Suggestion
from .tokens import language_for_path


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

    def to_json(self) -> dict:
        return {
            "path": self.path, "line": self.line, "column": self.column, "end_line": self.end_line,
            "end_column": self.end_column, "name": self.name,
            "score": None if self.score is None else round(self.score, 4),
            "threshold": round(self.threshold, 4),
            "suggestions": [suggestion_json(s) for s in self.suggestions],
        }


def suggestion_json(suggestion: Suggestion) -> dict:
    return {"name": suggestion.name, "score": round(suggestion.score, 4),
            "evidence": [{"path": path, "line": line} for path, line in suggestion.evidence]}


def _finding(source: SourceFile, judgement: Judgement, scorer: Scorer, threshold: float) -> Finding:
    variable = judgement.variable
    first = source.tokens[variable.occurrences[0]]
    places = [(source.tokens[i].line, source.tokens[i].column) for i in variable.occurrences]
    return Finding(
        path=source.path, line=first.line, column=first.column, end_line=first.line,
        end_column=first.column + len(variable.name), name=variable.name, score=judgement.oddness,
        threshold=threshold, flagged=scorer.is_flagged(judgement, threshold),
        suggestions=judgement.suggestions, variable=variable, occurrences=places,
    )


def analyse_text(text: str, path: str, language: str | None = None) -> SourceFile | None:
    """Lex and scope a document; None when its language is not supported."""
    language = language or language_for_path(path.rsplit("/", 1)[-1])
    if language is None:
        return None
    return analyse(text, path, language)


def check_source(scorer: Scorer, source: SourceFile, threshold: float | None = None,
                 flagged_only: bool = True) -> list[Finding]:
    """Every variable whose name does not fit its use (or every judged variable, if asked)."""
    limit = scorer.threshold if threshold is None else threshold
    findings = []
    variables = [v for v in source.variables if v.name not in IGNORED_NAMES]
    for judgement in scorer.judge_many(source, variables):
        finding = _finding(source, judgement, scorer, limit)
        if finding.flagged or not flagged_only:
            findings.append(finding)
    return findings


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
    limit = scorer.threshold if threshold is None else threshold
    finding = _finding(source, judgement, scorer, limit)
    if not finding.suggestions:
        return finding, "the model knows no names for this language yet"
    return finding, ""
