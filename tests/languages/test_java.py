"""Java: varargs, for-each and catch bindings, anonymous classes; the JDK as the judge of every rename."""

from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import cues, rename, run, variables

PROGRAM = """\
import java.util.*;

public class Snippet {
    static final int LIMIT = 3;
    private int calls = 0;

    public int total(String label, int... amounts) {
        int sum = 0;
        for (int amount : amounts) {
            sum += amount;
        }
        for (int index = 0; index < LIMIT; index++) {
            sum += index;
        }
        calls++;
        return sum + label.length();
    }

    static String describe(final List<String> items) {
        StringBuilder text = new StringBuilder();
        Comparator<String> byLength = new Comparator<String>() {
            int compared = 0;
            public int compare(String left, String right) {
                compared++;
                return Integer.compare(left.length(), right.length());
            }
        };
        List<String> sorted = new ArrayList<>(items);
        sorted.sort(byLength);
        var first = sorted.get(0);
        try {
            Integer.parseInt(first);
        } catch (NumberFormatException | NullPointerException problem) {
            text.append(problem.getClass().getSimpleName());
        }
        return text.append(":").append(String.join(",", sorted)).toString();
    }

    public static void main(String[] args) {
        Snippet counter = new Snippet();
        System.out.println(counter.total("ab", 1, 2, 3) + " " + describe(List.of("ccc", "a", "bb")));
    }
}
"""


def test_bindings_worked_by_hand():
    found = variables(PROGRAM, "java")
    assert set(found) == {"label", "amounts", "sum", "amount", "index", "items", "text", "byLength", "left",
                          "right", "sorted", "first", "problem", "args", "counter"}
    assert found["amounts"] == (PARAMETER, [(7, 43), (9, 27)]), "a varargs parameter is the name alone"
    assert found["problem"] == (LOCAL, [(33, 63), (34, 25)]), "a multi-catch binds its last name"
    assert found["index"][1][0] == (12, 18) and len(found["index"][1]) == 4


def test_fields_and_constants_are_not_variables():
    found = variables(PROGRAM, "java")
    # Class constants, fields and an anonymous class's fields are members, not locals.
    assert not {"LIMIT", "calls", "compared"} & set(found)


def test_public_methods_have_public_parameters():
    from cognomen.model.corpus import analyse
    source = analyse(PROGRAM, "Snippet.java", "java")
    assert {v.name for v in source.variables if v.public_parameter} == {"label", "amounts", "left", "right", "args"}


def test_renaming_every_variable_keeps_the_program_working(tmp_path):
    before = run("java", PROGRAM, tmp_path / "before")
    assert before.strip() == "11 NumberFormatException:a,bb,ccc"
    assert run("java", rename(PROGRAM, "java"), tmp_path / "after") == before


# JPype1 1.5.2 (PyPI source), native/java: JPypePackageManager.java:229 names a variable `module`,
# HtmlWriter.java:49 opens a resource in `try (...)`, JPypeContext.java:615 locks on `this.typeFactory`.
REAL_SHAPES = """\
import java.io.*;
import java.util.*;

public class Snippet {
    private final List<String> typeFactory = new ArrayList<>();

    int sizes(List<String> modules) throws IOException {
        int total = 0;
        for (String module : modules) {
            total += module.length();
        }
        try (StringWriter buffer = new StringWriter();
                PrintWriter out = new PrintWriter(buffer)) {
            out.print(total);
            out.flush();
            total = Integer.parseInt(buffer.toString());
        }
        synchronized (this.typeFactory) {
            this.typeFactory.add("x");
        }
        Comparator<String> byLength = (left, right) -> {
            return left.length() - right.length();
        };
        modules.sort(byLength);
        return total + typeFactory.size();
    }

    public static void main(String[] args) throws IOException {
        System.out.println(new Snippet().sizes(new ArrayList<>(List.of("abc", "de"))));
    }
}
"""


def test_real_shapes_worked_by_hand(tmp_path):
    found = variables(REAL_SHAPES, "java")
    assert set(found) == {"modules", "total", "module", "buffer", "out", "byLength", "left", "right", "args"}
    assert found["module"] == (LOCAL, [(9, 21), (10, 22)]), "`module` is a name outside module-info.java"
    assert found["buffer"] == (LOCAL, [(12, 27), (13, 51), (16, 38)]), "a resource lives in its try block"
    assert found["left"] == (PARAMETER, [(21, 40), (22, 20)]), "a lambda's untyped parameter"
    before = run("java", REAL_SHAPES, tmp_path / "before")
    assert before.strip() == "6"
    assert run("java", rename(REAL_SHAPES, "java"), tmp_path / "after") == before


def test_flow_cues_worked_by_hand():
    found = cues(PROGRAM, "Snippet.java", "java")
    assert {"parameter:total#1", "holds:amount"} <= found["amounts"]
    assert {"type:int", "iterated:amounts"} <= found["amount"]
    assert {"type:many String", "parameter:describe#0"} <= found["items"], "`List<String> items`"
    assert {"type:many String", "call:ArrayList"} <= found["sorted"], "`new ArrayList<>(items)`"
    assert {"call:get", "receiver:sorted"} <= found["first"]
    assert {"type:Snippet", "call:Snippet"} <= found["counter"]
