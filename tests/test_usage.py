"""Usage patterns of a variable, on a hand-worked example (the patterns are our own definitions)."""

import numpy as np

from cognomen.model.chunks import read_python
from cognomen.model.usage import USAGES, profile_logs, profile_scores, usage_flags

SNIPPET = '''
def summarise(path, limit):
    rows = load_rows(path)
    total = 0
    for row in rows:
        total += row.size * 2
    if rows is None:
        return rows
    print(len(rows), limit)
    return total
'''


def flags_of(name):
    tokens, variables = read_python(SNIPPET)
    variable = next(v for v in variables if v.name == name)
    return {usage for usage, flag in zip(USAGES, usage_flags(tokens, variable.occurrences)) if flag}


def test_usage_patterns_by_hand():
    assert flags_of("rows") == {"bound_to_call", "iterated", "tested", "compared_with_none", "returned", "argument",
                                "measured"}
    assert flags_of("row") == {"attribute", "measured"}  # `row.size`
    assert flags_of("total") == {"bound_to_literal", "arithmetic", "returned"}  # `+=` counts as arithmetic
    assert flags_of("limit") == {"argument"}
    assert flags_of("path") == {"argument"}


def test_a_name_whose_variables_are_iterated_fits_an_iterated_variable_better():
    # Two names, 10 variables each: `items` always iterated, `count` never; a third name never seen.
    counts = np.zeros((3, len(USAGES)))
    counts[0, USAGES.index("iterated")] = 10
    variables = np.array([10.0, 10.0, 0.0])
    log_yes, log_no = profile_logs(counts, variables)
    iterated = np.zeros((1, len(USAGES)), dtype=np.float32)
    iterated[0, USAGES.index("iterated")] = 1
    scores = profile_scores(iterated, log_yes, log_no)[0]
    assert scores[0] > scores[2] > scores[1]
    assert abs(scores[2]) < 1e-5  # a name never seen has only the overall profile: no evidence either way
