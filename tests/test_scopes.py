"""The token-based scope finder across languages, by example (each language has its own file in languages/)."""

from cognomen.model.scopes import LOCAL, PARAMETER, find_variables
from cognomen.model.languages import lex


def positions(text, language):
    tokens = lex(text, language)
    return {v.name: (v.kind, [(tokens[i].line, tokens[i].column) for i in v.occurrences])
            for v in find_variables(text, tokens, language)}


def test_typescript_bindings():
    found = positions("function add(cart, item, quantity = 1) {\n  const total = cart.total + item.price;\n"
                      "  let count = 0;\n  for (const line of cart.lines) { count += line.quantity; }\n"
                      "  return { total: total, count };\n}\n", "typescript")
    assert found["cart"][0] == PARAMETER and len(found["cart"][1]) == 3
    assert found["total"] == (LOCAL, [(2, 9), (5, 19)]), "object keys and members are not uses"
    assert len(found["count"][1]) == 3
    assert found["line"][0] == LOCAL


def test_go_bindings():
    found = positions("package main\nfunc (s *Server) Handle(req *Request) error {\n\tcount := 0\n"
                      "\tfor i, item := range req.Items { count += item.N + i }\n\treturn nil\n}\n", "go")
    assert found["req"][0] == PARAMETER and len(found["req"][1]) == 2
    assert len(found["count"][1]) == 2
    assert {"i", "item"} <= set(found)


def test_java_bindings_skip_fields():
    found = positions("class A { private int field;\n public int sum(List<Integer> values, int start) {\n"
                      "  int total = start;\n  for (int value : values) { total += value; }\n  return total;\n } }",
                      "java")
    assert "field" not in found
    assert found["values"][0] == PARAMETER and len(found["values"][1]) == 2
    assert len(found["total"][1]) == 3


def test_rust_and_c_bindings():
    rust = positions("fn area(width: u32, height: u32) -> u32 {\n    let mut total = width * height;\n"
                     "    total += 1;\n    total\n}\n", "rust")
    assert rust["width"][0] == PARAMETER and len(rust["total"][1]) == 3
    c = positions("int sum(int *values, int count) {\n  int total = 0;\n  for (int i = 0; i < count; i++) "
                  "{ total += values[i]; }\n  return total;\n}\n", "c")
    assert c["count"][0] == PARAMETER and len(c["total"][1]) == 3 and "i" in c
