"""What is judged at all: names dictated from elsewhere, names kept on purpose, and languages with
too little code for a threshold. Real standard-library code and the stdlib-trained session model."""

import math

import pytest

from cognomen.model.corpus import Corpus, analyse
from cognomen.model.findings import check_source
from cognomen.model.training import MIN_LANGUAGE_LINES, TrainSettings, train

from .conftest import STDLIB

DICTATED = '''\
import logging
from typing import overload

import pytest


class Base:
    def handle(self, request, deadline):
        return request, deadline


class Special(Base):
    def handle(self, zzz_odd, qqq_odd):  # the base names these parameters
        return zzz_odd, qqq_odd


class Handler(logging.Handler):
    def emit(self, zzz_record):  # logging.Handler.emit, from the standard library
        print(zzz_record)


class Box:
    @property
    def size(self):
        return 1

    @size.setter
    def size(self, zzz_value):
        print(zzz_value)

    def __eq__(self, zzz_other):
        return zzz_other is self

    def _get_colour(self):
        return 1

    def _set_colour(self, zzz_colour):
        print(zzz_colour)

    colour = property(_get_colour, _set_colour)  # the setter passed to property()


@overload
def parse(zzz_text: str) -> int: ...


def lookup(_zzz_unused, key):
    return key


@pytest.fixture
def zzz_fixture(tmp_path):
    return tmp_path


def test_something(zzz_fixture, monkeypatch):
    assert zzz_fixture and monkeypatch
'''


def test_dictated_names_are_never_flagged(stdlib_scorer):
    source = analyse(DICTATED, "dictated.py", "python")
    judged = {f.name: f for f in check_source(stdlib_scorer, source, threshold=-math.inf, flagged_only=False)}
    for name, why in (("zzz_odd", "Base.handle"), ("qqq_odd", "Base.handle"), ("zzz_record", "logging.Handler.emit"),
                      ("zzz_value", "setter"), ("zzz_colour", "setter"), ("zzz_other", "`__eq__`"), ("zzz_text", "@overload"),
                      ("_zzz_unused", "unused"), ("tmp_path", "fixtures"), ("zzz_fixture", "fixtures"),
                      ("monkeypatch", "fixtures")):
        assert not judged[name].flagged, name
        assert why in judged[name].dictated, (name, judged[name].dictated)
    # The same kind of name, not dictated, is judged (and flagged at a threshold this low).
    assert judged["key"].dictated == "" and judged["key"].score is not None


def test_override_and_trait_methods_in_token_languages():
    java = analyse("class A extends B {\n  @Override\n  public int size(int zzz) { return zzz; }\n"
                   "  public int count(int yyy) { return yyy; }\n}\n", "A.java", "java")
    found = {v.name: v.dictated for v in java.variables}
    assert found["zzz"] and not found["yyy"]
    rust = analyse("impl Display for Meter {\n    fn fmt(&self, zzz: &mut Formatter) -> Result { zzz.finish() }\n}\n"
                   "impl Meter {\n    fn read(&self, yyy: u32) -> u32 { yyy }\n}\n", "meter.rs", "rust")
    found = {v.name: v.dictated for v in rust.variables}
    assert found["zzz"] and not found["yyy"]


def test_a_keep_name_comment_silences_check(any_odd_scorer):
    stdlib_scorer = any_odd_scorer
    text = (STDLIB / "textwrap.py").read_text(encoding="utf-8")
    source = analyse(text, "textwrap.py", "python")
    flagged = check_source(stdlib_scorer, source, threshold=-5.0)
    assert flagged, "at this threshold some names of textwrap.py are flagged"
    target = flagged[0]
    lines = text.split("\n")
    lines[target.line - 1] += "  # cognomen: keep-name"
    kept: list = []
    again = check_source(stdlib_scorer, analyse("\n".join(lines), "textwrap.py", "python"), threshold=-5.0, kept=kept)
    assert (target.name, target.line) not in {(f.name, f.line) for f in again}
    assert (target.name, target.line) in {(f.name, f.line) for f in kept}
    accepted = check_source(stdlib_scorer, source, threshold=-5.0, accepted={"text*.py": [target.name]})
    assert target.name not in {f.name for f in accepted}


@pytest.fixture(scope="module")
def stdlib_files(stdlib_corpus):
    return sorted((f for f in stdlib_corpus.files if "/" not in f.path), key=lambda f: f.path)


def test_too_little_code_gets_suggestions_only_and_says_so(stdlib_files):
    small, lines = [], 0
    for source in stdlib_files:
        if lines + source.lines < MIN_LANGUAGE_LINES - 200:
            small.append(source)
            lines += source.lines
    trained = train(Corpus(small, {}), TrainSettings(epochs=1, workers=1))
    assert trained.thresholds == {}
    assert "under 2,000" in trained.languages["python"]["suggestions_only"]


def test_three_thousand_lines_get_a_threshold(stdlib_files):
    chosen, lines = [], 0
    for source in stdlib_files:
        if lines >= 3_000:
            break
        chosen.append(source)
        lines += source.lines
    trained = train(Corpus(chosen, {}), TrainSettings(epochs=1, workers=1))
    assert math.isfinite(trained.thresholds["python"])
    assert trained.languages["python"]["lines"] >= 3_000


def test_evidence_never_cites_the_variables_own_place(stdlib_scorer):
    # A file the model learned from, with variables renamed after training (the model has not yet
    # retrained): the old name fits best, and the model's evidence for it includes the very place
    # being judged, which must never be cited.
    from cognomen.model.findings import suggest_at
    text = (STDLIB / "textwrap.py").read_text(encoding="utf-8")
    original = analyse(text, "textwrap.py", "python")
    cited_elsewhere = checked = 0
    for variable in [v for v in original.variables if v.kind == "local"][:60]:
        tokens = original.tokens
        lines = text.split("\n")
        for index in sorted(variable.occurrences, reverse=True):
            token = tokens[index]
            line = lines[token.line - 1]
            lines[token.line - 1] = line[:token.column - 1] + "zzz_renamed" + line[token.column - 1 + len(token.text):]
        renamed = analyse("\n".join(lines), "textwrap.py", "python")
        first = tokens[variable.occurrences[0]]
        finding, _ = suggest_at(stdlib_scorer, renamed, first.line, first.column)
        old = next((s for s in finding.suggestions if s.name == variable.name), None) if finding else None
        if old is None:
            continue
        checked += 1
        for path, line in old.evidence:
            assert not (path == "textwrap.py" and variable.scope_start <= line <= variable.scope_end), \
                (variable.name, line)
            cited_elsewhere += 1
    assert checked >= 5 and cited_elsewhere


def test_repeats_of_one_pattern_in_a_file_are_reported_once():
    from cognomen.model.findings import Finding
    from cognomen.model.scoring import Suggestion
    from cognomen.server.commands.check import grouped

    def finding(line, name, first):
        return Finding("a.go", line, 1, line, 2, name, 5.0, 1.0, True, [Suggestion(first, 1.0)], None)

    found = grouped([finding(3, "r", "reader"), finding(9, "r", "reader"), finding(12, "r", "req"),
                     finding(20, "d", "decoder")])
    assert [(f.line, [r.line for r in repeats]) for f, repeats in found] == [(3, [9]), (12, []), (20, [])]
