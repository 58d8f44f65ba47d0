"""Top-N vocabulary with a minimum count and one unknown token, on a hand-counted example."""

from cognomen.model.languages import lex
from cognomen.model.vocabulary import RESERVED, build_vocabulary, count_tokens


def test_top_n_and_unknown_counts():
    # Hand count of the tokens below: a x3, = x3, <num> x3, b x2, c x1, ( x1, ) x1, print x1
    source = "a = 1\na = 2\nb = a\nb = 3\nprint(c)\n"
    counts, kinds = count_tokens([lex(source, "python")])
    assert counts["a"] == 3 and counts["="] == 4 and counts["b"] == 2 and counts["c"] == 1
    vocabulary = build_vocabulary(counts, kinds, size=len(RESERVED) + 3, min_count=2)
    assert vocabulary.tokens[len(RESERVED):] == ["=", "<num>", "a"]
    # b (2), c (1), print (1), ( (1), ) (1) fall outside the top 3: 6 occurrences are unknown.
    assert vocabulary.counts[0] == 6
    assert vocabulary.id("c") == 0 and vocabulary.id("zzz") == 0
    assert vocabulary.kinds[vocabulary.id("a")] == "name"


def test_minimum_count_drops_rare_tokens():
    counts, kinds = count_tokens([lex("x = y\nx = z\n", "python")])
    vocabulary = build_vocabulary(counts, kinds, size=100, min_count=2)
    assert "x" in vocabulary.index and "y" not in vocabulary.index and "z" not in vocabulary.index


def test_long_tail_on_the_standard_library(stdlib_corpus):
    # Common practice: a small vocabulary covers most identifier occurrences (Zipf's law).
    from collections import Counter
    counts = Counter(t.text for f in stdlib_corpus.files for t in f.tokens if t.kind == "name")
    total = sum(counts.values())
    top = sum(count for _, count in counts.most_common(1000))
    assert top / total > 0.5
