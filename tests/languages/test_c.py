"""C and C++: typed declarations, pointers, members through `->`, `.` and `::`, range-for and lambdas;
gcc and g++ as the judges of every rename."""

from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import rename, run, variables

C_PROGRAM = """\
#include <stdio.h>

struct point { int x; int y; };

static int sum(const int *values, int count) {
    int total = 0;
    for (int i = 0; i < count; i++) {
        total += values[i];
    }
    return total;
}

int main(void) {
    int data[] = {4, 5, 6};
    struct point origin = { .x = 1, .y = 2 };
    struct point *cursor = &origin;
    int result = sum(data, 3) + cursor->x + origin.y;
    printf("%d\\n", result);
    return 0;
}
"""

CPP_PROGRAM = """\
#include <iostream>
#include <vector>
#include <string>

class Counter {
public:
    explicit Counter(int start) : count(start) {}
    int add(const std::vector<int>& items) {
        for (const auto& item : items) {
            count += item;
        }
        return count;
    }
private:
    int count;
};

int main() {
    std::vector<int> numbers{1, 2, 3};
    Counter counter(10);
    int offset = 2;
    auto shifted = [&](int value) { return value + offset; };
    auto total = counter.add(numbers);
    std::string label = "total";
    std::cout << label << " " << shifted(total) << std::endl;
    return 0;
}
"""


def test_c_bindings_worked_by_hand():
    found = variables(C_PROGRAM, "c")
    assert found["values"] == (PARAMETER, [(5, 27), (8, 18)]), "`const int *values`: the name alone"
    assert found["i"] == (LOCAL, [(7, 14), (7, 21), (7, 32), (8, 25)])
    assert found["origin"] == (LOCAL, [(15, 18), (16, 29), (17, 45)]), "`.x = 1` and `origin.y` are members"
    assert not {"x", "y", "point"} & set(found)


def test_cpp_bindings_worked_by_hand():
    found = variables(CPP_PROGRAM, "cpp")
    assert found["item"] == (LOCAL, [(9, 26), (10, 22)]), "range-for through `const auto&`"
    assert found["value"] == (PARAMETER, [(22, 28), (22, 44)]), "a lambda's parameter"
    assert found["label"] == (LOCAL, [(24, 17), (25, 18)]), "`std::string label`: `::` joins a path"
    assert "count" not in found, "a member, reached without `this->`, is not a local"


def test_renaming_every_variable_keeps_the_programs_working(tmp_path):
    for language, program, output in (("c", C_PROGRAM, "18"), ("cpp", CPP_PROGRAM, "total 18")):
        before = run(language, program, tmp_path / language / "before")
        assert before.strip() == output
        assert run(language, rename(program, language), tmp_path / language / "after") == before


# lz4 4.3.3 (PyPI source): lz4.c:871 reads `cctx->tableType` beside a parameter `tableType`, lz4.c:2001
# shifts by a constant (`token >> ML_BITS;`), lz4/frame/_frame.c:819 passes `linked ? Py_True : Py_False`,
# lz4hc.c:477 reaches a parameter through a macro (`#define op (*_op)`).
C_REAL_SHAPES = """\
#include <stdio.h>

#define SHIFT 4
typedef struct { int tableType; int size; } state_t;

static int encode(state_t *state, int tableType, int token, int linked, int **_op) {
#define op (*_op)
    int length = token >> SHIFT;
    int on = 1;
    int off = 0;
    printf("%d %d\\n", length, linked ? on : off);
    op = &state->size;
    return state->tableType == tableType;
#undef op
}

int main(void) {
    state_t current = { 2, 7 };
    int *place = 0;
    int same = encode(&current, 2, 64, 1, &place);
    printf("%d %d\\n", same, *place);
    return 0;
}
"""


def test_c_real_shapes_worked_by_hand(tmp_path):
    found = variables(C_REAL_SHAPES, "c")
    assert set(found) == {"state", "tableType", "token", "linked", "length", "on", "off", "current", "place", "same"}, \
        "`SHIFT` and `on` in `linked ? on : off` are no declarations; `_op` is used by a macro's body"
    assert found["tableType"] == (PARAMETER, [(6, 39), (13, 32)]), "`state->tableType` is a member"
    before = run("c", C_REAL_SHAPES, tmp_path / "before")
    assert before == "4 1\n1 7\n"
    assert run("c", rename(C_REAL_SHAPES, "c"), tmp_path / "after") == before
