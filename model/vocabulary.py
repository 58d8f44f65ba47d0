"""Token counts, a top-N vocabulary with a minimum count, and one unknown token for the rest."""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from operator import attrgetter

from .tokens import UNKNOWN_TOKEN

SELF_TOKEN = "<self>"  # stands for the variable's own other occurrences in its contexts
PAD_TOKEN = "<pad>"  # before the start and after the end of a file
RESERVED = (UNKNOWN_TOKEN, SELF_TOKEN, PAD_TOKEN)


@dataclass
class Vocabulary:
    """Tokens in row order (reserved tokens first) with their counts and kinds."""

    tokens: list[str]
    counts: list[int]
    kinds: list[str]

    def __post_init__(self) -> None:
        self.index = {token: row for row, token in enumerate(self.tokens)}

    def __len__(self) -> int:
        return len(self.tokens)

    def id(self, token: str) -> int:
        """Row of a token, or the unknown token's row."""
        return self.index.get(token, 0)

    def ids(self, tokens: list[str]) -> list[int]:
        index = self.index
        return [index.get(token, 0) for token in tokens]

    def to_json(self) -> dict:
        return {"tokens": self.tokens, "counts": self.counts, "kinds": self.kinds}

    @classmethod
    def from_json(cls, data: dict) -> "Vocabulary":
        tokens, counts, kinds = data["tokens"], data["counts"], data["kinds"]
        if not (len(tokens) == len(counts) == len(kinds)) or tokens[: len(RESERVED)] != list(RESERVED):
            raise ValueError("vocabulary lists disagree in length or lack the reserved tokens")
        return cls(list(tokens), [int(c) for c in counts], list(kinds))


def count_tokens(streams) -> tuple[Counter, dict[str, Counter]]:
    """Occurrence counts of token texts, and for each text how often each kind lexed it."""
    pairs: Counter = Counter()
    text_and_kind = attrgetter("text", "kind")
    for tokens in streams:
        pairs.update(map(text_and_kind, tokens))
    counts: Counter = Counter()
    kinds: dict[str, Counter] = {}
    for (text, kind), count in pairs.items():
        counts[text] += count
        kinds.setdefault(text, Counter())[kind] += count
    return counts, kinds


def build_vocabulary(counts: Counter, kinds: dict[str, Counter], size: int = 50_000,
                     min_count: int = 2) -> Vocabulary:
    """The `size` most frequent tokens seen at least `min_count` times; ties broken by text."""
    ranked = sorted((item for item in counts.items() if item[1] >= min_count and item[0] not in RESERVED),
                    key=lambda item: (-item[1], item[0]))[: max(size - len(RESERVED), 0)]
    unknown = sum(counts.values()) - sum(count for _, count in ranked)
    tokens = list(RESERVED) + [token for token, _ in ranked]
    token_counts = [unknown, 0, 0] + [count for _, count in ranked]
    token_kinds = ["unknown", "self", "pad"] + [kinds[token].most_common(1)[0][0] for token, _ in ranked]
    return Vocabulary(tokens, token_counts, token_kinds)
