"""JavaScript: bindings worked out by hand, and node as the judge of every rename."""

from cognomen.model.corpus import analyse
from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import cues, rename, run, variable_list, variables

# Destructuring with defaults, rest elements and holes; object shorthand in patterns and in
# literals (a rename must keep the property's name); keys that merely look like variables.
PROGRAM = """\
function summarise(orders, { currency = "EUR", rounding } = {}, ...extras) {
  const { total: grandTotal, count } = orders.reduce((acc, order) => {
    acc.total += order.amount;
    acc.count += 1;
    return acc;
  }, { total: 0, count: 0 });
  const [first, , third = "none", ...rest] = extras;
  let label = `${currency}:`;
  for (const [key, value] of Object.entries({ grandTotal, count })) {
    label += ` ${key}=${value}`;
  }
  try {
    JSON.parse("{");
  } catch (problem) {
    label += problem ? " bad" : "";
  }
  var width = 3, height = width * 2;
  const result = { label, rounding, first, third, rest: rest.length, area: width * height };
  return result;
}
console.log(JSON.stringify(summarise([{ amount: 2 }, { amount: 3 }], { rounding: 2 }, "a", "b", "c", "d")));
"""


def test_bindings_worked_by_hand():
    found = variables(PROGRAM, "javascript")
    assert set(found) == {"orders", "currency", "rounding", "extras", "grandTotal", "count", "acc", "order",
                          "first", "third", "rest", "label", "key", "value", "problem", "width", "height",
                          "result"}
    assert found["rounding"] == (PARAMETER, [(1, 48), (18, 27)]), "a pattern's shorthand is a binding"
    assert found["count"] == (LOCAL, [(2, 30), (9, 59)]), "`count: 0` and `acc.count` are not uses"
    assert found["grandTotal"] == (LOCAL, [(2, 18), (9, 47)]), "`total:` is the key, `grandTotal` the binding"
    assert found["rest"] == (LOCAL, [(7, 38), (18, 57)]), "`...rest` binds `rest`; `rest:` is a key"
    assert found["height"] == (LOCAL, [(17, 18), (18, 84)]), "every declarator of a `var` list"
    assert found["acc"][0] == PARAMETER and len(found["acc"][1]) == 4


def test_shorthand_keeps_the_property_name():
    renamed = rename(PROGRAM, "javascript", {"rounding": "digits", "count": "orderCount"})
    assert "{ currency = \"EUR\", rounding: digits } = {}" in renamed
    assert "const { total: grandTotal, count: orderCount }" in renamed
    assert "Object.entries({ grandTotal, count: orderCount })" in renamed
    assert "{ label, rounding: digits, first," in renamed
    assert "{ total: 0, count: 0 }" in renamed and "acc.count += 1" in renamed


def test_renaming_every_variable_keeps_the_program_working(tmp_path):
    # node is the judge: a missed use fails with a ReferenceError, a renamed key changes the output.
    before = run("javascript", PROGRAM, tmp_path / "before")
    assert before.startswith('{"label":"EUR: grandTotal=5 count=2 bad"')
    assert run("javascript", rename(PROGRAM, "javascript"), tmp_path / "after") == before


# moment.js 2.30.1 (npm), `relativeTime$1`: a module-level `thresholds` and a function whose parameter
# has the same name; the parameter's name sits before the function's "{", outside its body.
SHADOWING = """\
(function () {
  var limit = 10,
      thresholds = { s: 45 };
  function describe(seconds,
                    thresholds) {
    return seconds < thresholds.s ? "seconds" : "minutes";
  }
  console.log(describe(limit, thresholds), describe(50, { s: 60 }));
})();
"""


def test_a_parameter_shadows_an_outer_variable_of_its_name(tmp_path):
    found = {(kind, occurrences[0]): occurrences for _, kind, occurrences in variable_list(SHADOWING, "javascript")}
    assert found[(LOCAL, (3, 7))] == [(3, 7), (8, 31)], "the parameter's binding is not a use of the outer name"
    assert found[(PARAMETER, (5, 21))] == [(5, 21), (6, 22)]
    source = analyse(SHADOWING, "snippet.js", "javascript")
    assert {v.name: v.scope_start for v in source.variables}["seconds"] == 4, "the scope starts at the parameters"
    before = run("javascript", SHADOWING, tmp_path / "before")
    assert before == "seconds seconds\n"
    assert run("javascript", rename(SHADOWING, "javascript"), tmp_path / "after") == before


def test_for_in_takes_keys_and_for_of_takes_elements():
    # ECMAScript: `for (... in obj)` enumerates property keys, `for (... of iterable)` its values.
    text = ("function total(prices, orders) {\n  let sum = 0;\n  for (const name in prices) {\n"
            "    sum += prices[name];\n  }\n  for (const order of orders) {\n    sum += order.amount;\n  }\n"
            "  return sum;\n}\n")
    found = cues(text, "total.js", "javascript")
    assert "key_of:prices" in found["name"] and "iterated:prices" not in found["name"]
    assert "iterated:orders" in found["order"]
