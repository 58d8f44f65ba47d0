"""C#: typed and `var` declarations, ref/out/params parameters, object initializers and anonymous
types; worked by hand (no .NET toolchain is assumed on the machine)."""

from cognomen.model.languages import get_language
from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import cues, rename, variables

SOURCE = """\
class Meter {
    const int Max = 3;
    private int count;
    public Meter(int start, params int[] rest) { count = start + rest.Length; }
    void Read(ref int total, out int last, in int scale) {
        var sum = total + Max;
        foreach (var item in values) { sum += item * scale; }
        var shown = new { sum, label = "x" };
        var options = new Options { Sum = sum, Limit = scale };
        last = Send(shown, timeout: sum);
    }
}
"""


def test_bindings_worked_by_hand():
    found = variables(SOURCE, "csharp")
    assert set(found) == {"start", "rest", "total", "last", "scale", "sum", "item", "shown", "options"}
    assert found["rest"] == (PARAMETER, [(4, 42), (4, 66)]), "`params int[] rest`: the name alone"
    assert found["scale"] == (PARAMETER, [(5, 51), (7, 54), (9, 56)]), "`item * scale` multiplies"
    assert found["item"] == (LOCAL, [(7, 22), (7, 47)])
    assert not {"Max", "count", "Sum", "Limit", "label"} & set(found)


def test_rename_keeps_initializer_properties_and_anonymous_members():
    renamed = rename(SOURCE, "csharp", {"sum": "running"})
    assert "        var shown = new { sum = running, label = \"x\" };" in renamed
    assert "        var options = new Options { Sum = running, Limit = scale };" in renamed
    assert "last = Send(shown, timeout: running);" in renamed


def test_named_arguments_make_parameter_renames_risky():
    assert get_language("csharp").keyword_arguments and get_language("python").keyword_arguments
    assert not any(get_language(name).keyword_arguments for name in ("javascript", "typescript", "go", "java",
                                                                       "rust", "c", "cpp"))


# pythonnet 3.0.5 (PyPI source), src/runtime: Converter.cs:310 writes variables into interpolated strings
# (`$"... {obType} ..."`); a named argument whose label is a variable's name (`Send(timeout: timeout)`).
INTERPOLATED = """\
class Report {
    string Describe(Type obType, int count, int timeout) {
        var typeString = obType.Name;
        Send(timeout: timeout, retries: count);
        return $"{typeString} x{count,4:N0} in {obType.Namespace} {{literal}}" + $@"
{timeout}";
    }
}
"""


def test_interpolated_strings_and_argument_labels_worked_by_hand():
    found = variables(INTERPOLATED, "csharp")
    assert found["typeString"] == (LOCAL, [(3, 13), (5, 19)]), "`{typeString}` in an interpolated string is a use"
    assert found["count"] == (PARAMETER, [(2, 38), (4, 41), (5, 33)]), "`{count,4:N0}`: the name before its format"
    assert found["obType"] == (PARAMETER, [(2, 26), (3, 26), (5, 49)])
    assert found["timeout"] == (PARAMETER, [(2, 49), (4, 23), (6, 2)]), \
        "`timeout:` labels the argument; a verbatim interpolated string goes on to the next line"
    renamed = rename(INTERPOLATED, "csharp", {"timeout": "limit", "count": "total"})
    assert "        Send(timeout: limit, retries: total);" in renamed
    assert '$"{typeString} x{total,4:N0} in {obType.Namespace} {{literal}}" + $@"\n{limit}";' in renamed


def test_flow_cues_worked_by_hand():
    found = cues(SOURCE, "Meter.cs", "csharp")
    assert {"parameter:Meter#1", "type:many int"} <= found["rest"], "`params int[] rest`"
    assert "keyword:timeout" in found["sum"], "a named argument, `timeout: sum`"
    assert "call:Options" in found["options"] and "call:Send" in found["last"]
