"""How a variable is used, in a dozen yes-or-no patterns read from the tokens around its uses.

`rows = load_rows(path)` then `for row in rows:` and `len(rows)`: a value bound to a call,
iterated and measured. Each candidate name has a profile, the share of the team's variables
of that name that show each pattern; a variable's patterns are scored against every profile
(a log-likelihood ratio against the profile of all variables), so that a name whose
variables the team never iterates does not win for a variable that is iterated.
"""

from __future__ import annotations

import numpy as np

from .tokens import NAME, NUMBER, STRING, Token

USAGES = ("iterated", "called", "indexed", "attribute", "compared_with_none", "argument", "arithmetic",
          "returned", "bound_to_call", "bound_to_literal", "tested", "measured")
_NONE = frozenset({"None", "null", "nil", "undefined"})
_COMPARISONS = frozenset({"is", "==", "!=", "="})
_ARITHMETIC = frozenset({"+", "-", "*", "/", "%"})
_TESTS = frozenset({"if", "not", "while", "and", "or", "!", "elif", "&", "|", "?"})
_ITERATION = frozenset({"in", "of", "range"})
_SIZES = frozenset({"len", "length", "size", "count"})
PRIOR = 4.0  # pseudo-variables of the overall profile added to each name's


def usage_flags(tokens: list[Token], occurrences: list[int], limit: int = 24) -> np.ndarray:
    """1.0 for each pattern seen at any of the occurrences, else 0.0."""
    flags = np.zeros(len(USAGES), dtype=np.float32)
    last = len(tokens) - 1

    def text(index: int) -> str:
        return tokens[index].text if 0 <= index <= last else ""

    for i in occurrences[:limit]:
        before, after, after2 = text(i - 1), text(i + 1), text(i + 2)
        if before in _ITERATION:
            flags[0] = 1.0
        if after == "(":
            flags[1] = 1.0
        elif after == "[":
            flags[2] = 1.0
        elif after == ".":
            flags[3] = 1.0
        if (after in _COMPARISONS and (after2 in _NONE or (after2 == "not" and text(i + 3) in _NONE))) or \
                (before in _COMPARISONS and text(i - 2) in _NONE):
            flags[4] = 1.0
        if before in ("(", ",") and after in (")", ","):
            flags[5] = 1.0
            if before == "(" and text(i - 2) in _SIZES:
                flags[11] = 1.0
        if before in _ARITHMETIC or after in _ARITHMETIC:
            flags[6] = 1.0
        if before == "return":
            flags[7] = 1.0
        if after in ("=", ":=") and before not in (".", "("):
            value = i + 2
            if 0 <= value <= last and tokens[value].kind in (STRING, NUMBER) and (
                    text(value + 1) in ("", ";") or tokens[min(value + 1, last)].line != tokens[value].line):
                flags[9] = 1.0
            for j in range(value, min(value + 6, last)):
                if tokens[j].line != tokens[i].line:
                    break
                if tokens[j].kind == NAME and text(j + 1) == "(":
                    flags[8] = 1.0
                    break
        if before in _TESTS:
            flags[10] = 1.0
        if after == "." and text(i + 2) in _SIZES:
            flags[11] = 1.0
    return flags


def profile_logs(counts: np.ndarray, variables: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Per name, the log-ratio of its share of variables with and without each pattern to the
    overall shares; a name with few variables leans on the overall profile (PRIOR pseudo-variables)."""
    overall = (counts.sum(axis=0) + 1.0) / (float(variables.sum()) + 2.0)
    shares = np.clip((counts + PRIOR * overall[None, :]) / (variables[:, None] + PRIOR), 1e-6, 1 - 1e-6)
    log_yes = np.log(shares) - np.log(overall)[None, :]
    log_no = np.log1p(-shares) - np.log1p(-overall)[None, :]
    return log_yes.astype(np.float32), log_no.astype(np.float32)


def profile_scores(flags: np.ndarray, log_yes: np.ndarray, log_no: np.ndarray) -> np.ndarray:
    """(variables x names) log-likelihood ratio of each variable's patterns under each name's
    profile against the overall one; 0 for a name that has only the overall profile."""
    return flags @ log_yes.T + (1.0 - flags) @ log_no.T
