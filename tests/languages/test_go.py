"""Go: receivers, grouped and variadic parameters, named results, composite literals; worked by hand
(no Go toolchain is assumed on the machine)."""

from cognomen.model.corpus import analyse
from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import cues, rename, variables

SOURCE = """\
package irrigation

import (
\t"io"
\tv1 "example.com/fernhill/api/v1"
)

func (s *Scheduler) Plan(r io.Reader, low, high int, zones ...string) (io.Reader, error) {
\tcount := 0
\tfor index, zone := range zones {
\t\tcount += index + len(zone)
\t}
\tcfg := v1.Config{Low: low, high: high, Count: count}
\treturn v1.Wrap(r, cfg), nil
}

func parse(line string) (value int, err error) {
\tapply := func(step int) int { return step * 2 }
\tswitch kind := v1.Kind(line); kind {
\tcase v1.Dry, v1.Wet:
\t\tvalue = apply(len(line))
\t}
\tif n, ok := lookup(line); ok {
\t\tvalue += n
\t}
\treturn
}
"""


def test_parameters_worked_by_hand():
    found = variables(SOURCE, "go")
    assert found["r"] == (PARAMETER, [(8, 26), (14, 17)])
    assert found["low"][0] == PARAMETER, "`low, high int`: both names share the type"
    assert found["zones"] == (PARAMETER, [(8, 54), (10, 27)]), "a variadic parameter is the name alone"
    assert found["value"][0] == PARAMETER and found["err"][0] == PARAMETER, "named results are variables"
    assert found["step"] == (PARAMETER, [(18, 16), (18, 39)]), "a function literal's parameter"


def test_package_names_and_receivers_are_not_variables():
    found = variables(SOURCE, "go")
    # `io.Reader` in the unnamed result list and `v1.Config` are package qualifiers; `s` is the receiver.
    assert not {"io", "v1", "s", "Reader", "error"} & set(found)
    assert set(found) == {"r", "low", "high", "zones", "count", "index", "zone", "cfg", "line", "value", "err",
                          "apply", "step", "kind", "n", "ok"}


def test_composite_literal_keys_are_fields():
    found = variables(SOURCE, "go")
    assert found["high"] == (PARAMETER, [(8, 44), (13, 35)]), "`high: high`: the key is a field"
    renamed = rename(SOURCE, "go", {"high": "ceiling", "count": "total"})
    assert "\tcfg := v1.Config{Low: low, high: ceiling, Count: total}" in renamed
    assert "func (s *Scheduler) Plan(r io.Reader, low, ceiling int, zones ...string) (io.Reader, error) {" in renamed


def test_exported_functions_have_public_parameters():
    source = analyse(SOURCE, "plan.go", "go")
    assert {v.name for v in source.variables if v.public_parameter} == {"r", "low", "high", "zones"}
    assert found_kind(source, "count") == LOCAL


def found_kind(source, name):
    return next(v.kind for v in source.variables if v.name == name)


# golang.org/x/net 0.7.0 (Debian golang-golang-x-net-dev): http/httpproxy/proxy.go:283 names a parameter
# after the package of its type, proxy/per_host.go:106 declares `net` from a call on package `net`.
SHADOWED_PACKAGES = """\
package proxy

import (
\t"net"
\t"net/url"
)

func canonicalAddr(url *url.URL) string {
\taddr := url.Hostname()
\treturn addr
}

func (p *PerHost) AddHost(host string) {
\tfor _, zone := range p.zones {
\t\tif _, net, err := net.ParseCIDR(host); err == nil {
\t\t\tp.AddNetwork(net, zone)
\t\t}
\t}
}
"""


def test_a_package_named_like_a_variable_stays_the_package():
    found = variables(SHADOWED_PACKAGES, "go")
    assert found["url"] == (PARAMETER, [(8, 20), (9, 10)]), "`*url.URL` is the package's type"
    assert found["net"] == (LOCAL, [(15, 9), (16, 17)]), "`net.ParseCIDR` runs before `net` is declared"
    assert "_" not in found, "the blank identifier binds nothing"
    renamed = rename(SHADOWED_PACKAGES, "go", {"url": "address", "net": "network"})
    assert "func canonicalAddr(address *url.URL) string {\n\taddr := address.Hostname()" in renamed
    assert "if _, network, err := net.ParseCIDR(host); err == nil {\n\t\t\tp.AddNetwork(network, zone)" in renamed


def test_flow_cues_worked_by_hand():
    found = cues(SOURCE, "plan.go", "go")
    assert {"parameter:Plan#0", "type:Reader", "argument:Wrap#0"} <= found["r"], "`r io.Reader` passed to Wrap"
    assert "type:many string" in found["zones"] and "holds:zone" in found["zones"], "`zones ...string`, ranged over"
    assert "iterated:zones" in found["zone"] and "key_of:zones" in found["index"]
    assert {"keyword:Low"} <= found["low"] and "keyword:Count" in found["count"], "composite-literal keys"
    assert {"call:Config", "receiver:v1"} <= found["cfg"]
    assert not found["n"] and not found["ok"], "`n, ok := lookup(...)` gives neither the call's result alone"


def test_named_results_are_what_the_function_returns_not_its_parameters():
    found = cues(SOURCE, "plan.go", "go")
    assert "parameter:parse#0" in found["line"]
    assert "returned:parse" in found["value"] and "returned:parse" in found["err"]
    assert not any(cue.startswith("parameter:") for cue in found["value"] | found["err"]), \
        "a caller's second argument is not the named result `value`"


def test_a_lone_range_variable_takes_keys_not_elements():
    # The Go specification, "For statements with range clause": with one iteration variable, a
    # range over a slice gives its indexes and over a map its keys.
    text = ("package p\n\nfunc f(refs map[string]bool, rows []int) int {\n\tn := 0\n"
            "\tfor left := range refs {\n\t\tn += len(left)\n\t}\n"
            "\tfor i := range rows {\n\t\tn += i\n\t}\n"
            "\tfor _, row := range rows {\n\t\tn += row\n\t}\n\treturn n\n}\n")
    found = cues(text, "p.go", "go")
    assert "key_of:refs" in found["left"] and "iterated:refs" not in found["left"]
    assert "key_of:rows" in found["i"] and "iterated:rows" in found["row"]


def test_a_map_value_looped_over_beside_its_key_is_marked_as_such():
    # `for pkgName, symbols := range refs` (golang.org/x/tools internal/imports/fix.go): beside a
    # key, the value is the map's value; beside an index (Go's habit: `i`) or `_`, an element.
    text = ("package p\n\nfunc f(refs map[string][]string, rows []int) int {\n\tn := 0\n"
            "\tfor pkgName, symbols := range refs {\n\t\tn += len(pkgName) + len(symbols)\n\t}\n"
            "\tfor k, v := range refs {\n\t\tn += len(k) + len(v)\n\t}\n"
            "\tfor i, row := range rows {\n\t\tn += i + row\n\t}\n"
            "\tfor _, cell := range rows {\n\t\tn += cell\n\t}\n\treturn n\n}\n")
    found = cues(text, "p.go", "go")
    assert {"iterated:refs", "value_of:refs"} <= found["symbols"] and "value_of:refs" in found["v"]
    assert "iterated:rows" in found["row"] and not any(c.startswith("value_of:") for c in found["row"] | found["cell"])


def test_a_chained_call_gives_no_cue_of_its_first_call():
    source = "package p\n\nfunc save(w io.Writer, v any) error {\n\terr := json.NewEncoder(w).Encode(v)\n" \
             "\tenc := json.NewEncoder(w)\n\t_ = enc\n\treturn err\n}\n"
    found = cues(source, "save.go", "go")
    assert not any(cue.startswith(("call:", "receiver:")) for cue in found["err"]), found["err"]
    assert "call:NewEncoder" in found["enc"]
