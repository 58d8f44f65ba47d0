"""Java: varargs, for-each and catch bindings, anonymous classes; the JDK as the judge of every rename."""

from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import rename, run, variables

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
