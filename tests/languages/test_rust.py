"""Rust: `let` and `for` patterns, `&mut`, closures, struct shorthand; rustc as the judge of every rename."""

from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import rename, run, variable_list

PROGRAM = """\
struct Reading {
    zone: u32,
    level: i64,
}

fn total(readings: &mut Vec<Reading>, mut scale: i64, (low, high): (i64, i64)) -> i64 {
    let mut sum = 0;
    for (index, reading) in readings.iter_mut().enumerate() {
        reading.level *= scale;
        sum += reading.level + index as i64;
    }
    scale += 1;
    let clamp = |value: i64| -> i64 { if value < low { low } else if value > high { high } else { value } };
    let doubled: Vec<i64> = readings.iter().map(|r| { let twice = r.level * 2; twice }).collect();
    let &first = doubled.first().unwrap_or(&0);
    clamp(sum + first + scale)
}

fn make(zone: u32, level: i64) -> Reading {
    let extra = level + 1;
    Reading { zone, level: extra }
}

fn main() {
    let mut readings = vec![make(1, 4), make(2, 5)];
    let found = total(&mut readings, 2, (0, 100));
    if let Some(last) = readings.last() {
        let Reading { zone, level: depth } = last;
        println!("{} {} {}", found, zone, depth);
    }
}
"""


def test_bindings_worked_by_hand():
    found = {(name, kind): places for name, kind, places in variable_list(PROGRAM, "rust")}
    assert found[("readings", PARAMETER)] == [(6, 10), (8, 29), (14, 29)], "`&mut Vec` is the type, not the name"
    assert found[("scale", PARAMETER)][0] == (6, 43), "`mut scale` binds `scale`"
    assert found[("low", PARAMETER)][0] == (6, 56) and found[("high", PARAMETER)][0] == (6, 61)
    assert found[("first", LOCAL)] == [(15, 10), (16, 17)], "`let &first` binds `first`"
    assert found[("value", PARAMETER)] == [(13, 18), (13, 42), (13, 70), (13, 99)], "a closure's parameter"
    assert found[("twice", LOCAL)] == [(14, 59), (14, 80)]
    assert found[("zone", PARAMETER)] == [(19, 9), (21, 15)], "`Reading { zone, ... }` uses the parameter"
    assert found[("depth", LOCAL)] == [(28, 36), (29, 43)], "`level: depth` binds `depth`, not the field"
    names = {name for name, _ in found}
    assert not {"Some", "Reading", "level_field", "self"} & names


def test_struct_shorthand_keeps_the_field_name():
    renamed = rename(PROGRAM, "rust", {"zone": "area"})
    assert "    Reading { zone: area, level: extra }" in renamed
    assert "        let Reading { zone: area, level: depth } = last;" in renamed


def test_renaming_every_variable_keeps_the_program_working(tmp_path):
    before = run("rust", PROGRAM, tmp_path / "before")
    assert before.strip() == "46 2 12"
    assert run("rust", rename(PROGRAM, "rust"), tmp_path / "after") == before


# memchr 2.5.0 (Debian librust-memchr-dev): memmem/mod.rs:515 `fn find_iter<'a, 'h>(&'a self, ...)`,
# memchr/fallback.rs:57 passes variables to a call inside a struct literal, prefilter/mod.rs:247 compares
# (`if skipped > MAX {`) in a method, memchr/mod.rs:106 nests `fn imp(n1, haystack)` in a function with
# a parameter of the same name. Format strings name variables since Rust 2021 (`{total}`).
REAL_SHAPES = """\
struct Finder<'n> {
    needle: &'n [u8],
}

struct Span {
    start: usize,
    end: usize,
}

impl<'n> Finder<'n> {
    fn find<'a, 'h>(&'a self, haystack: &'h [u8], skipped: usize) -> Option<usize> {
        if skipped > haystack.len() {
            return None;
        }
        let start = skipped;
        let span = Span { start: first(start, haystack), end: haystack.len() };
        fn first(start: usize, haystack: &[u8]) -> usize {
            start.min(haystack.len())
        }
        let total = span.end - span.start;
        let total = total + self.needle.len();
        println!("{total} {start:>3} {{literal}}");
        haystack[span.start..span.end].windows(self.needle.len()).position(|window| window == self.needle)
    }
}

fn main() {
    let finder = Finder { needle: b"lo" };
    println!("{:?}", finder.find(b"hello world", 1));
}
"""


def test_real_shapes_worked_by_hand(tmp_path):
    found = {(name, occurrences[0]): occurrences for name, _, occurrences in variable_list(REAL_SHAPES, "rust")}
    assert not any(name.startswith("'") or name == "a" for name, _ in found), "lifetimes are no variables"
    assert found[("skipped", (11, 51))] == [(11, 51), (12, 12), (15, 21)], "`if skipped > ...` is no function"
    assert found[("haystack", (11, 31))] == [(11, 31), (12, 22), (16, 47), (16, 63), (23, 9)], \
        "the nested function's parameter is its own"
    assert found[("start", (15, 13))] == [(15, 13), (16, 40), (22, 28)], \
        "`first(start, haystack)` passes arguments, it names no fields; `{start:>3}` formats the variable"
    assert found[("total", (20, 13))] == [(20, 13), (21, 13), (21, 21), (22, 20)], \
        "a shadowing `let` in the same block, and a name inside a format string"
    before = run("rust", REAL_SHAPES, tmp_path / "before")
    assert before == "12   1 {literal}\nSome(2)\n"
    assert run("rust", rename(REAL_SHAPES, "rust"), tmp_path / "after") == before


def test_flow_cues_worked_by_hand():
    from cognomen.model.corpus import analyse
    cues = {}
    for variable in analyse(PROGRAM, "snippet.rs", "rust").variables:
        cues.setdefault((variable.name, variable.function), set()).update(variable.cues)
    assert {"parameter:total#0", "type:many Reading"} <= cues[("readings", "total")], "`&mut Vec<Reading>`"
    assert "type:many i64" in cues[("doubled", "total")]
    assert {"call:first", "receiver:doubled"} <= cues[("first", "total")]
    assert "keyword:level" in cues[("extra", "make")], "`Reading { zone, level: extra }`"
    assert "call:total" in cues[("found", "main")]
    assert not any(cue.startswith("argument:Some") for cue in cues[("last", "main")]), "a pattern is no argument"
