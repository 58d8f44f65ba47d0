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
