"""Name flow: the names cues imply, the repository index, and what it lets through (hand-worked)."""

import pytest

from cognomen.model.flow import (FileFlow, FlowIndex, FlowView, build_index, describe, implied_names, plural,
                                 safe_key, singular, variable_flow)
from cognomen.model.scopes import Variable


def test_implied_names():
    assert implied_names("call:load_user_profile", "snake") == ["user_profile", "profile"]
    assert implied_names("call:openSession", "camel") == ["session"]
    assert implied_names("receiver:frames", "snake") == ["frame"]
    assert implied_names("receiver:cache", "snake") == [], "only a plural container names its items"
    assert implied_names("iterated:users", "camel") == ["user"]
    assert implied_names("holds:reading", "snake") == ["readings"]
    assert implied_names("type:many Session", "snake") == ["sessions"]
    assert implied_names("returned:get_timeout", "snake") == ["timeout"]
    assert implied_names("keyword:max_retries", "snake") == ["max_retries", "retries"]
    assert implied_names("argument:send#0", "snake") == [], "an argument's name comes from the index, not its word"


# Common practice: English plurals as most code writes them.
def test_singular_and_plural():
    for one, many in (("user", "users"), ("entry", "entries"), ("box", "boxes"), ("batch", "batches"),
                      ("address", "addresses")):
        assert plural(one) == many and singular(many) == one


def test_a_string_key_counts_only_when_made_of_the_teams_words():
    team = frozenset({"max", "retries", "home", "secret", "value"})
    assert safe_key("max_retries", team) and safe_key("HOME", team)
    assert not safe_key("zq_SECRET_7f3a9c_value", team), "planted secret: `zq` is no word of the team's"
    assert not safe_key("kq81Lz0ZZy7", team)


def test_the_index_keeps_secret_keys_out():
    variables = [Variable("limit", "local", [0], 1, 1, cues=("key:max_retries",)),
                 Variable("token", "local", [0], 1, 1, cues=("key:zq_SECRET_7f3a9c_value",))]

    class Source:
        path, tokens = "app.py", [type("T", (), {"line": 1})()]

    Source.variables = variables
    index = build_index([Source], frozenset(), frozenset({"max", "retries"}), 0.3)
    assert "key:max_retries" in index.given and not any("zq" in cue for cue in index.given)


def test_a_parameter_hears_what_callers_pass_and_an_argument_the_parameters_name():
    index = FlowIndex()
    for name in ("invoice", "invoice", "bill"):
        index.add("argument:send#0", name)
    parameter = Variable("x", "parameter", [0], 1, 1, cues=("parameter:send#0",))
    flow = variable_flow(parameter, FlowView(index), "snake", lambda name: True)
    assert flow.candidates()[0] == "invoice"
    reason, cue = flow.reason("invoice")
    assert cue == "argument:send#0" and "callers pass `invoice`" in reason
    index.add("parameter:send#0", "invoice")  # `def send(invoice)`
    argument = Variable("y", "local", [0], 1, 1, cues=("argument:send#0",))
    flow = variable_flow(argument, FlowView(index), "snake", lambda name: True)
    assert flow.features("invoice")[0] > flow.features("bill")[0]


def test_a_variable_never_backs_its_own_name():
    index = FlowIndex()
    index.add("call:average_moisture", "flag")  # the variable itself, counted at training
    own = Variable("flag", "local", [0], 1, 1, cues=("call:average_moisture",))
    flow = variable_flow(own, FlowView(index, current=FileFlow()), "snake", lambda name: True, weight=1.0)
    assert flow.features("flag")[0] == 0.0 and "flag" not in flow.candidates()
    assert "moisture" in flow.candidates(), "the callee still implies a name"


def test_evidence_reads_as_a_sentence():
    assert describe("receiver", "frames", "frame", 12) == "values from `frames` are called `frame` in 12 places"
    assert describe("keyword", "timeout", "timeout", 0) == "it is passed as `timeout=`"


def test_features_of_many_names_equal_one_at_a_time():
    index = FlowIndex()
    for name, cue in (("invoice", "argument:send#0"), ("invoice", "argument:send#0"), ("bill", "argument:send#0"),
                      ("invoice", "call:load_invoice"), ("draft", "call:load_invoice"), ("draft", "returned:*")):
        index.add(cue, name)
    variable = Variable("x", "local", [0], 1, 1, cues=("argument:send#0", "call:load_invoice", "returned:make"))
    flow = variable_flow(variable, FlowView(index), "snake", lambda name: True)
    names = ["invoice", "bill", "draft", "nothing", "invoice_draft"]
    many = flow.features_many(names)
    for row, name in zip(many, names):
        assert list(row) == pytest.approx(flow.features(name)), name


def test_shortened_forms_read_as_the_same_word():
    from cognomen.model.flow import _shortens_words, same_word

    assert same_word("req", "request") and same_word("dst", "destination") and same_word("frames", "frame")
    assert same_word("user_id", "uid") is False and same_word("key", "section") is False
    assert _shortens_words("lopt", "_long_opts") and _shortens_words("opts", "long_opts")
    assert not _shortens_words("key", "sections")


def contradicting_index():
    """A team that calls the items of `indexes` an `index` (9 of 10 places), and what
    `open_session()` gives a `session`."""
    index = FlowIndex()
    for _ in range(9):
        index.add("iterated:indexes", "index")
        index.add("call:open_session", "session")
    index.add("iterated:indexes", "idx_entry")
    for _ in range(5):
        index.add("iterated:tokens", "key")
    return index


def flow_of(index, name, cues):
    return variable_flow(Variable(name, "local", [0], 1, 1, cues=cues), FlowView(index), "snake",
                         lambda other: True)


def test_a_loop_variable_is_contradicted_where_the_team_and_the_collections_word_agree():
    index = contradicting_index()
    assert flow_of(index, "constraint", ("iterated:indexes",)).contradiction("constraint") == \
        ("index", "iterated:indexes", 0.9)
    assert flow_of(index, "idx", ("iterated:indexes",)).contradiction("idx") is None, "a shortening"
    assert flow_of(index, "idx_entry", ("iterated:indexes",)).contradiction("idx_entry") is None, \
        "a name the team also gives there"
    assert flow_of(index, "token", ("iterated:tokens",)).contradiction("token") is None, "the word names it"
    assert flow_of(index, "secret", ("iterated:tokens",)).contradiction("secret") is None, \
        "the team says `key` but the word says `token`: no agreement, no flag"
    assert flow_of(index, "zone", ("iterated:open_valves",)).contradiction("zone") is None, \
        "the collection's word alone is not enough"
    assert flow_of(index, "result", ("call:open_session",)).contradiction("result") is None, \
        "a callee's habit backs suggestions, never a flag"
    assert flow_of(index, "lopt", ("iterated:_long_opts",)).contradiction("lopt") is None
    for _ in range(5):
        index.add("iterated:keys", "key")
    assert flow_of(index, "alias", ("iterated:keys",)).contradiction("alias") is None, \
        "the keys of a mapping are named for what they identify: `key` says less than `alias`"
    assert flow_of(index, "arg", ("iterated:indexes", "checked:hasattr")).contradiction("arg") is None, \
        "an item whose kind the code tests is not yet what its collection's word says"
    assert flow_of(index, "columns", ("iterated:indexes", "value_of:indexes")).contradiction("columns") is None, \
        "a map's value beside its key (`for name, columns := range indexes`) may be anything the map holds"
    assert flow_of(index, "columns", ("iterated:indexes",)).contradiction("columns") is not None

