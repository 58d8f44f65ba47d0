"""Name flow: the names a team gives a value, by where the value comes from and where it goes.

Each language module reads cues per variable, "kind:word":

  call        the value is what calling `word` returns        `session = open_session()`
  receiver    the value is got from, or an item of, `word`    `frame = self.frames.get(key)`, `rows[i]`
  attribute   the value is the attribute `word`               `timeout = config.timeout`
  key         the value is read or stored under key `word`    `cmd = args.get("cmd")`
  iterated    the value is an element of `word`               `for user in users`
  key_of      the value is a key of the mapping `word`        `for name, value in settings.items()`
  argument    the value is passed as argument "callee#k"      `send(invoice)`
  keyword     the value is passed as keyword `word`           `send(timeout=limit)`
  store       the value is stored as attribute `word`         `self.timeout = limit`
  added_to    the value is added to the collection `word`     `users.append(user)`
  holds       the value is a collection of `word`s            `users.append(user)`, `for user in users`
  returned    the value is what function `word` returns (and "*" for any function)
  parameter   the value is parameter "function#k"             `def send(invoice, ...)`
  type        the value's declared type is `word` ("many T" for a collection of T)
  default     a parameter's default value is `word`
  checked     the code asks what kind of value it is, with `word` (`isinstance(x, ...)`); not counted
  value_of    the value is a map's value, looped over beside its key (Go `for name, pkg := range pkgs`);
              not counted: it only keeps its `iterated` cue from contradicting a name

The repository index (`FlowIndex`) counts, for every cue, the names the team gives there; an
argument and the callee's parameter at the same position index each other. Cues give
candidate names (even names the team never used for a local: parameter names, keywords,
singulars, de-verbed callees) and features for ranking and detection.
"""

from __future__ import annotations

import math
import re
from collections import Counter
from collections.abc import Mapping
from dataclasses import dataclass, field

import numpy as np

from .tokens import join_subtokens, split_identifier

# Leading words of function names that describe the action, not the thing returned.
VERBS = frozenset("""get set load make create read parse build compute find fetch new to is has
    open init calc calculate extract format render collect resolve lookup gen generate add
    update apply convert normalize normalise prepare decode encode wrap split join check ensure
    do run start fill select pick choose read write""".split())
# Cues whose word names the value outright; the rest hint at it.
STRONG_KINDS = frozenset({"keyword", "store", "key", "parameter", "argument", "returned", "type", "default"})
# A cue's word that says nothing about a value's name (`keys`, like `items`, names a role in a mapping:
# `for alias in keys` says more than `key` would).
_NOTHING = frozenset({"self", "cls", "this", "super", "it", "x", "_", "value", "values", "obj", "object", "args",
                      "kwargs", "data", "item", "items", "keys", "result", "results", "str", "int", "len", "list",
                      "dict", "tuple", "set", "repr", "type", "isinstance", "print", "format", "join", "append",
                      "get"})
_PLURAL = re.compile(r"(?:[^s]s|ies|xes|ches|shes|sses)$")


class CueTable(Mapping):
    """The index's counts as stored: the names at each cue in three arrays, a cue's Counter built
    only when a file asks for it (a model learned from a million lines holds a few hundred thousand
    cues; a file looks at a few hundred)."""

    def __init__(self, cues: list[str], names: list[str], indptr, name_ids, counts):
        self.position = {cue: number for number, cue in enumerate(cues)}
        self.cues, self.names = cues, names
        self.indptr, self.name_ids, self.counts = indptr, name_ids, counts
        self.built: dict[str, Counter] = {}

    def __getitem__(self, cue: str) -> Counter:
        found = self.built.get(cue)
        if found is None:
            number = self.position[cue]
            start, end = int(self.indptr[number]), int(self.indptr[number + 1])
            found = Counter(dict(zip((self.names[i] for i in self.name_ids[start:end].tolist()),
                                     self.counts[start:end].tolist())))
            if len(self.built) > 50_000:
                self.built.clear()
            self.built[cue] = found
        return found

    def __contains__(self, cue) -> bool:
        return cue in self.position

    def __iter__(self):
        return iter(self.cues)

    def __len__(self) -> int:
        return len(self.cues)


@dataclass
class FlowIndex:
    """For each cue, the names the team gives there (counts), and a few places for each."""

    given: Mapping = field(default_factory=dict)  # cue -> Counter of names (a CueTable once stored)
    places: dict[tuple[str, str], list[tuple[str, int]]] = field(default_factory=dict)
    _ranked: dict[str, tuple[list[tuple[str, float]], float]] = field(default_factory=dict, repr=False)
    _name_totals: Counter | None = field(default=None, repr=False)
    _grand_total: float = field(default=0.0, repr=False)

    def name_share(self, name: str) -> float:
        """How often a name is given at any cue, as a share of every name given (smoothed)."""
        if self._name_totals is None:
            totals: Counter = Counter()
            if isinstance(self.given, CueTable):
                sums = np.bincount(np.asarray(self.given.name_ids), weights=np.asarray(self.given.counts),
                                   minlength=len(self.given.names))
                totals = Counter(dict(zip(self.given.names, sums.tolist())))
            else:
                for counter in self.given.values():
                    totals.update(counter)
            self._name_totals = totals
            self._grand_total = float(sum(totals.values()))
        return (self._name_totals.get(name, 0.0) + 1.0) / (self._grand_total + len(self._name_totals) + 1.0)

    def ranked(self, cue: str) -> tuple[list[tuple[str, float]], float]:
        """A cue's names, most given first, and their total (worked out once per cue)."""
        found = self._ranked.get(cue)
        if found is None:
            counter = self.given[cue]
            found = (counter.most_common(), float(sum(counter.values())))
            if len(self._ranked) > 50_000:
                self._ranked.clear()
            self._ranked[cue] = found
        return found

    def add(self, cue: str, name: str, weight: float = 1.0, place: tuple[str, int] | None = None) -> None:
        counter = self.given.get(cue)
        if counter is None:
            counter = self.given[cue] = Counter()
        counter[name] += weight
        if place is not None:
            found = self.places.setdefault((cue, name), [])
            if len(found) < 2:
                found.append(place)

    def stored(self) -> tuple[dict, dict]:
        """The index as plain documents and arrays for the model bundle, less what scoring never uses:
        weak cues seen only once, and places of all but a cue's three most given names."""
        cues = [cue for cue in sorted(self.given) if kept_cue(cue, sum(self.given[cue].values()))]
        names: dict[str, int] = {}
        indptr, name_ids, counts = [0], [], []
        for cue in cues:
            for name, count in sorted(self.given[cue].items(), key=lambda item: (-item[1], item[0])):
                name_ids.append(names.setdefault(name, len(names)))
                counts.append(count)
            indptr.append(len(name_ids))
        paths: dict[str, int] = {}
        place_rows = []
        for number, cue in enumerate(cues):
            for name, _ in self.given[cue].most_common(3):
                for path, line in self.places.get((cue, name), []):
                    place_rows.append([number, names[name], paths.setdefault(path, len(paths)), line])
        documents = {"cues": cues, "names": list(names), "paths": list(paths)}
        arrays = {"flow_indptr": np.array(indptr, dtype=np.int64), "flow_names": np.array(name_ids, dtype=np.int32),
                  "flow_counts": np.array(counts, dtype=np.float32),
                  "flow_places": np.array(place_rows, dtype=np.int32).reshape(len(place_rows), 4)}
        return documents, arrays

    @classmethod
    def from_stored(cls, documents: dict, arrays: dict) -> "FlowIndex":
        cues, names, paths = documents["cues"], documents["names"], documents["paths"]
        if len(arrays["flow_indptr"]) != len(cues) + 1 or len(arrays["flow_names"]) != len(arrays["flow_counts"]):
            raise ValueError("the flow index's arrays disagree with its cues")
        index = cls(CueTable(cues, names, arrays["flow_indptr"], arrays["flow_names"], arrays["flow_counts"]))
        for cue, name, path, line in np.asarray(arrays["flow_places"]).tolist():
            index.places.setdefault((cues[cue], names[name]), []).append((paths[path], line))
        return index


def kept_cue(cue: str, total: float) -> bool:
    """Whether a cue is evidence at all: a hint seen once (`r = MockRequest(...)` in one place) is
    a coincidence; a strong cue (a parameter's one caller) counts from one place on."""
    return total >= 2.0 - 1e-6 or cue.split(":", 1)[0] in STRONG_KINDS


@dataclass
class FileFlow:
    """One file's share of the flow index, so that the file can be scored without it."""

    given: dict[str, Counter] = field(default_factory=dict)


def file_flow(variables, weight: float = 1.0) -> FileFlow:
    own = FileFlow()
    for variable in variables:
        for cue in index_cues(variable.cues):
            own.given.setdefault(cue, Counter())[variable.name] += weight
    return own


NOT_COUNTED = ("checked:", "value_of:")  # cues that only qualify others


def index_cues(cues) -> list[str]:
    """The cues a variable is counted under: its own (but those in NOT_COUNTED, which name no
    value), and "returned:*" for any returned value."""
    found = [cue for cue in cues if not cue.startswith(NOT_COUNTED)]
    if any(cue.startswith("returned:") for cue in cues):
        found.append("returned:*")
    return found


def build_index(sources, background: frozenset[str], team_subtokens: frozenset[str],
                background_weight: float) -> FlowIndex:
    """The index over every file; a string key counts only if every sub-token of it is one of the team's."""
    index = FlowIndex()
    for source in sources:
        weight = background_weight if source.path in background else 1.0
        for variable in source.variables:
            place = None if source.path in background else \
                (source.path, source.tokens[variable.occurrences[0]].line)
            for cue in index_cues(variable.cues):
                if cue.startswith("key:") and not safe_key(cue[4:], team_subtokens):
                    continue
                index.add(cue, variable.name, weight, place)
    return index


def safe_key(word: str, team_subtokens: frozenset[str]) -> bool:
    """A string key may name a value only if it reads as the team's own words (never a secret)."""
    parts = split_identifier(word)
    return bool(parts) and all(part in team_subtokens for part in parts)


class CueCounts:
    """The names given at one cue in the index, adjusted by a delta (this file's share in or out)."""

    __slots__ = ("ranked", "counts", "delta", "total")

    def __init__(self, ranked: list[tuple[str, float]], counts: Counter, total: float, delta: dict[str, float]):
        self.ranked, self.counts, self.delta = ranked, counts, delta
        # A share taken out that the index never held (a file changed since training) takes out nothing.
        self.total = total + sum(max(counts.get(name, 0.0) + change, 0.0) - counts.get(name, 0.0)
                                 for name, change in delta.items())

    def get(self, name: str) -> float:
        count = self.counts.get(name, 0.0) + self.delta.get(name, 0.0)
        return count if count > 1e-6 else 0.0

    def share(self, name: str) -> float:
        return self.get(name) / self.total if self.total > 1e-6 else 0.0

    def top(self, limit: int, allowed) -> list[tuple[str, float]]:
        """The most common allowed names, best first."""
        found = []
        seen = set()
        for name, count in self.ranked:
            count += self.delta.get(name, 0.0)
            seen.add(name)
            if count > 1e-6 and allowed(name):
                found.append((name, count))
                if len(found) >= limit:
                    break  # a file's own share seldom reorders the top
        found.extend((name, count) for name, count in self.delta.items()
                     if name not in seen and count > 1e-6 and name not in self.counts and allowed(name))
        found.sort(key=lambda item: -item[1])
        return found[:limit]


class FlowView:
    """The index as one file sees it: less the file's share the model learned (`learned`), plus the
    file as it stands now (`current`), so that code in the file, other functions included, counts
    while the model never remembers the file. A variable then leaves out its own share (`for_variable`)."""

    def __init__(self, index: FlowIndex, learned: FileFlow | None = None, current: FileFlow | None = None):
        self.index = index
        self.delta: dict[str, dict[str, float]] = {}
        for share, sign in ((learned, -1.0), (current, 1.0)):
            for cue, counter in (share.given.items() if share is not None else ()):
                entry = self.delta.setdefault(cue, {})
                for name, count in counter.items():
                    entry[name] = entry.get(name, 0.0) + sign * count

    def counts(self, cue: str, own_name: str | None = None, own_weight: float = 0.0) -> CueCounts | None:
        """The names at a cue; `own_name` takes the variable's own share out."""
        delta = self.delta.get(cue, {})
        if own_name is not None and own_weight:
            delta = dict(delta)
            delta[own_name] = delta.get(own_name, 0.0) - own_weight
        given = self.index.given.get(cue)
        if given is None:
            if not any(count > 1e-6 for count in delta.values()):
                return None
            ranked, total, given = [], 0.0, Counter()
        else:
            ranked, total = self.index.ranked(cue)
        found = CueCounts(ranked, given, total, delta)
        return found if found.total > 1e-6 and kept_cue(cue, found.total) else None


def cross_cue(cue: str) -> str | None:
    """An argument at position k and the callee's parameter k index each other."""
    if cue.startswith("argument:"):
        return "parameter:" + cue[len("argument:"):]
    if cue.startswith("parameter:"):
        return "argument:" + cue[len("parameter:"):]
    return None


def implied_names(cue: str, style: str) -> list[str]:
    """Names a cue's word suggests by itself, in the team's style: `frames` gives frame,
    `load_user_profile` gives user_profile and profile, `Session` gives session."""
    kind, _, word = cue.partition(":")
    if kind in ("argument", "parameter", "key_of", "value_of") or not word or word == "*":
        return []
    many = word.startswith("many ")
    parts = [p for p in split_identifier(word[5:] if many else word) if p.isalpha()]
    if not parts or word in _NOTHING:
        return []
    if kind in ("call", "returned") and parts[0] in VERBS:
        parts = parts[1:]
    if kind == "default" and parts[0] == "default":
        parts = parts[1:]
    if not parts or all(part in VERBS for part in parts):
        return []
    options = [parts]
    if kind in ("receiver", "iterated", "added_to"):
        if not _PLURAL.search(parts[-1]):
            return []
        options = [parts[:-1] + [singular(parts[-1])]]
    elif many or kind == "holds":
        options = [parts[:-1] + [plural(parts[-1])]]
    if len(options[0]) > 1:
        options.append(options[0][-1:])
    names = []
    for option in options:
        name = join_subtokens(option, style)
        if len(name) >= 2 and name.isidentifier() and name not in names:
            names.append(name)
    return names


def singular(word: str) -> str:
    if word.endswith("ies") and len(word) > 4:
        return word[:-3] + "y"
    if word.endswith(("sses", "xes", "ches", "shes")):
        return word[:-2]
    if word.endswith("s") and not word.endswith(("ss", "us", "is")):
        return word[:-1]
    return word


def plural(word: str) -> str:
    if word.endswith("y") and len(word) > 2 and word[-2] not in "aeiou":
        return word[:-1] + "ies"
    if word.endswith(("s", "x", "ch", "sh")):
        return word + "es"
    return word + "s"


FEATURES = ("flow_share", "flow_log_count", "flow_strong", "flow_weak", "flow_partial", "flow_cues", "flow_fit")
PRIOR = 2.0  # pseudo-names of the overall distribution added at each cue


@dataclass
class Flow:
    """One variable's cues, with what the index says at each: who is named what there."""

    cues: list[str]
    given: list[tuple[str, CueCounts]]  # (cue, names given there), cross cues included
    implied: dict[str, list[str]]  # name -> the cues that imply it by their word
    allowed: object  # name -> whether it may name this variable
    index: FlowIndex | None = None

    def __post_init__(self) -> None:
        self._own = own = frozenset(index_cues(self.cues))
        self._own_given = [counts for cue, counts in self.given if cue in own]
        self._implied_parts = {name: frozenset(split_identifier(name)) for name in self.implied}
        self._top_two: list | None = None

    def fit(self, name: str) -> float:
        """How much likelier the names given at the variable's own cues make this name than its
        overall frequency does (a sum of smoothed log ratios; 0 without cues)."""
        if self.index is None or not self._own_given:
            return 0.0
        overall = self.index.name_share(name)
        return sum(math.log((counts.get(name) + PRIOR * overall) / ((counts.total + PRIOR) * overall))
                   for counts in self._own_given)

    def candidates(self, limit_per_cue: int = 8) -> list[str]:
        """Names the cues put forward: the team's names at each cue, then names the words imply."""
        found: dict[str, None] = {}
        for _, counts in self.given:
            for name, _ in counts.top(limit_per_cue, self.allowed):
                found.setdefault(name)
        for name in self.implied:
            found.setdefault(name)
        return list(found)

    def features(self, name: str) -> list[float]:
        """How the cues back a name: the best share of the team's names at a cue, counts, how many
        cues' words name it outright or in part, and how much likelier the cues make it (see `fit`)."""
        share, total, fit = 0.0, 0.0, 0.0
        overall = self.index.name_share(name) if self.index is not None and self._own_given else 1.0
        for cue, counts in self.given:
            count = counts.get(name)
            if count:
                share = max(share, count / counts.total)
                total += count
            if cue in self._own:
                fit += math.log((count + PRIOR * overall) / ((counts.total + PRIOR) * overall))
        cues = self.implied.get(name, [])
        strong = sum(1 for cue in cues if cue.split(":", 1)[0] in STRONG_KINDS)
        partial = 0.0
        if self._implied_parts:
            parts = set(split_identifier(name))
            if parts:
                for other, other_parts in self._implied_parts.items():
                    if other != name:
                        partial = max(partial, len(parts & other_parts) / len(parts))
        return [share, math.log1p(total), float(strong), float(len(cues) - strong), partial, float(len(self.cues)),
                fit]

    def features_many(self, names: list[str]) -> np.ndarray:
        """`features` of many names at once (a shortlist), the same numbers."""
        rows = np.zeros((len(names), len(FEATURES)))
        rows[:, 5] = len(self.cues)
        if not names:
            return rows
        if self.given:
            counts = np.array([_counts_of(counts, names) for _, counts in self.given]).T
            counts[counts <= 1e-6] = 0.0  # as CueCounts.get
            totals = np.array([counts.total for _, counts in self.given])
            rows[:, 0] = (counts / totals).max(axis=1)
            rows[:, 1] = np.log1p(counts.sum(axis=1))
            own = [k for k, (cue, _) in enumerate(self.given) if cue in self._own]
            if own and self.index is not None:
                overall = np.array([self.index.name_share(name) for name in names])[:, None]
                rows[:, 6] = np.log((counts[:, own] + PRIOR * overall) / ((totals[own] + PRIOR) * overall)).sum(axis=1)
        if self.implied:
            for position, name in enumerate(names):
                cues = self.implied.get(name)
                if cues:
                    strong = sum(1 for cue in cues if cue.split(":", 1)[0] in STRONG_KINDS)
                    rows[position, 2], rows[position, 3] = strong, len(cues) - strong
                parts = set(split_identifier(name))
                if parts:
                    rows[position, 4] = max((len(parts & other_parts) / len(parts)
                                             for other, other_parts in self._implied_parts.items() if other != name),
                                            default=0.0)
        return rows

    def _tops(self) -> list[tuple[list[tuple[str, float]], float]]:
        """Each cue's two most common allowed names and its total, worked out once."""
        if self._top_two is None:
            self._top_two = [(counts.top(2, self.allowed), counts.total) for _, counts in self.given]
        return self._top_two

    def best_other_share(self, name: str) -> float:
        """The largest share any other name has at any cue."""
        best = 0.0
        for top, total in self._tops():
            for other, count in top:
                if other != name:
                    best = max(best, count / total)
                    break
        return best

    def peak(self) -> tuple[str | None, float]:
        """The name the team gives most consistently at one of the cues (at least 3 names there)."""
        best, best_share = None, 0.0
        for top, total in self._tops():
            if total < 3:
                continue
            if top and top[0][1] / total > best_share:
                best, best_share = top[0][0], top[0][1] / total
        return best, best_share

    def contradiction(self, name: str) -> tuple[str, str, float] | None:
        """(other name, cue, the team's share of `other` there) when the variable is an element of a
        collection and both the team and the collection's own word call such elements `other`, in
        at least the places and the share of names given there that CONTRADICTING asks (`for
        constraint in model._meta.indexes`, where the team says `index` in 12 places).

        Never when `name` is given at any of the variable's cues or named by their words, nor when
        it is a form of `other` (`req` for `request`, `frames` for `frame`) or a shortening of the
        collection's word (`lopt` for `long_opts`). None when nothing contradicts it."""
        if name in self.implied or any(counts.get(name) for _, counts in self.given):
            return None
        # An item the code tests the kind of (`if hasattr(arg, "resolve_expression")`) is not yet what
        # its collection's word says: the name may say what it is before that.
        unsure = any(cue.startswith("checked:") for cue in self.cues)
        by_cue = dict(zip((cue for cue, _ in self.given), self._tops()))
        found = None
        for cue in index_cues(self.cues):
            rule = contradicting_rule(cue)
            word = cue.partition(":")[2]
            # Nor is a map's value looped over beside its key (`value_of`) known to be one of what the map's word names.
            if rule is None or cue.startswith("iterated:") and (unsure or f"value_of:{word}" in self.cues):
                continue
            least_places, least_share = rule
            said = [other for other, cues in self.implied.items() if cue in cues and len(other.strip("_")) >= 3]
            top, total = by_cue.get(cue, ([], 0.0))
            if not said or not top or top[0][1] < least_places or _shortens_words(name, word):
                continue
            other, count = top[0]
            share = count / total
            if share >= least_share and len(other.strip("_")) >= 3 and \
                    any(same_word(other, implied) for implied in said) and not same_word(name, other) and \
                    (found is None or share > found[2]):
                found = (other, cue, share)
        return found

    def reason_at(self, cue: str, name: str) -> str:
        """What one of the variable's cues says of a name, in words."""
        counts = next((counts for given_cue, counts in self.given if given_cue == cue), None)
        kind, _, word = cue.partition(":")
        return describe(kind, word, name, int(round(counts.get(name))) if counts is not None else 0)

    def reason(self, name: str) -> tuple[str, str]:
        """Why the cues back a name, in words ("callers pass `invoice` here", "`frames.get(...)` gives a
        `frame`"), and the cue; empty when they do not."""
        best, best_share = None, 0.0
        for cue, counts in self.given:
            share = counts.share(name)
            if share > best_share and cue != "returned:*":
                best, best_share = (cue, counts), share
        if best is not None:
            cue, counts = best
            kind, _, word = cue.partition(":")
            return describe(kind, word, name, int(round(counts.get(name)))), cue
        for cue in self.implied.get(name, []):
            kind, _, word = cue.partition(":")
            return describe(kind, word, name, 0), ""
        return "", ""


# Cues that may contradict a name, and how much of the team's naming there must agree first: (places,
# share of the names given there). Read by reviewers on two real packages (Django, golang.org/x/net):
# flags from the items of a collection, where the team and the collection's word agree, were good
# catches nearly every time; from a callee, an attribute, a receiver or a key, a descriptive name
# traded for the team's habit (`outerq` for `query`) as often as not; from the collection's word
# alone, or two cues' words, false alarms mostly (`for name in families`, a map's keys).
CONTRADICTING = {"iterated": (3.0, 0.5)}


def contradicting_rule(cue: str) -> tuple[float, float] | None:
    """(places, share) the team must agree on before a cue contradicts a name (see CONTRADICTING);
    None for a cue that may not, or whose word tells nothing (under three letters, `self`, `data`)."""
    kind, _, word = cue.partition(":")
    rule = CONTRADICTING.get(kind)
    if rule is None or word in _NOTHING or len(word.strip("_")) < 3:
        return None
    return rule


def same_word(name: str, other: str) -> bool:
    """Whether two names share a word, one a shortening of the other's (`req` of `request`, `dst` of
    `destination`, `frame` of `frames`): a reviewer reads them as the same name."""
    parts, others = split_identifier(name), split_identifier(other)
    return any(_shortens(a, b) or _shortens(b, a) for a in parts for b in others)


def _shortens_words(name: str, word: str) -> bool:
    """`name` is made of the starts of `word`'s parts, in order (`lopt` of `long_opts`, `sopt` of
    `short_opts`)."""
    letters = name.lower().strip("_")
    parts = [part for part in split_identifier(word) if part]

    def match(at: int, part: int) -> bool:
        if at == len(letters):
            return True
        if part == len(parts):
            return False
        piece = parts[part]
        for size in range(min(len(piece), len(letters) - at), 0, -1):
            if letters[at:at + size] == piece[:size] and match(at + size, part + 1):
                return True
        return match(at, part + 1)

    return bool(letters) and bool(parts) and match(0, 0)


def _shortens(short: str, long: str) -> bool:
    """`short` is `long` or keeps its first letter and some of the rest in order."""
    if not short or not long or short[0] != long[0] or len(short) > len(long):
        return False
    letters = iter(long)
    return all(letter in letters for letter in short)


def _counts_of(counts: CueCounts, names: list[str]) -> list[float]:
    """counts.get of each name, before the threshold (features_many applies it to all at once)."""
    given, delta = counts.counts.get, counts.delta.get
    return [given(name, 0.0) + delta(name, 0.0) for name in names]


def describe(kind: str, word: str, name: str, count: int) -> str:
    """A cue in words, as evidence for a name."""
    times = f" in {count} place{'s' if count != 1 else ''}" if count else ""
    callee, _, position = word.partition("#")
    texts = {
        "call": f"`{word}(...)` gives a `{name}`{times}",
        "receiver": f"values from `{word}` are called `{name}`{times}",
        "attribute": f"`.{word}` is held in a `{name}`{times}",
        "key": f"the key `{word}` names a `{name}`{times}",
        "iterated": f"an element of `{word}` is a `{name}`{times}",
        "key_of": f"a key of `{word}` is a `{name}`{times}",
        "argument": f"`{callee}` calls its parameter {int(position) + 1 if position.isdigit() else position} "
                    f"`{name}`" if not count else f"callers pass `{name}` to `{callee}` here{times}",
        "parameter": f"callers pass `{name}` here{times}",
        "keyword": f"it is passed as `{word}=`",
        "store": f"it is stored as `.{word}`",
        "added_to": f"it is added to `{word}`",
        "holds": f"it holds `{word}` values",
        "returned": f"`{word}` returns it" if word != "*" else f"the team calls a returned value `{name}`{times}",
        "type": f"a `{word}` is called `{name}`{times}" if count else f"its type is `{word}`",
        "default": f"its default is `{word}`",
    }
    return texts.get(kind, "")


def variable_flow(variable, view: FlowView, style: str, allowed, weight: float = 0.0) -> Flow:
    """The flow a variable's cues describe, under `view`; `weight` is the variable's own share
    in the view (taken out), `allowed(name)` filters names."""
    given: list[tuple[str, CueCounts]] = []
    implied: dict[str, list[str]] = {}
    own = set(index_cues(variable.cues))
    for cue in index_cues(variable.cues):
        for looked_up in (cue, cross_cue(cue)):
            if not looked_up:
                continue
            counts = view.counts(looked_up, variable.name, weight if looked_up in own else 0.0)
            if counts is not None:
                given.append((looked_up, counts))
        for name in implied_names(cue, style):
            if allowed(name):
                implied.setdefault(name, []).append(cue)
    return Flow(list(variable.cues), given, implied, allowed, view.index)
