"""TypeScript: optional, rest and property parameters, non-null assertions, type literals; worked by hand."""

from cognomen.model.corpus import analyse
from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import rename, variables

SOURCE = """\
export function describe(first: string, third?: number, ...args: string[]): string {
  const shown = third ?? args.length;
  return `${first}:${shown}`;
}
class Meter {
  private readonly unit: string = "mm";
  static LIMIT = 3;
  constructor(private port: number, public label?: string, scale = 1) {
    this.unit = String(scale * port);
  }
  read(sensor?: Sensor, { offset, gain: factor }: Options = {}): Reading {
    const value = sensor!.value * factor + offset;
    const reading: { value: number; unit: string } = { value, unit: this.unit };
    return reading;
  }
}
"""


def test_optional_and_rest_parameters_are_the_identifier_alone():
    found = variables(SOURCE, "typescript")
    assert found["third"] == (PARAMETER, [(1, 41), (2, 17)])
    assert found["args"] == (PARAMETER, [(1, 60), (2, 26)])
    assert found["sensor"] == (PARAMETER, [(11, 8), (12, 19)])
    assert not any("?" in name or "." in name or "!" in name for name in found)


def test_fields_and_property_parameters_are_not_variables():
    found = variables(SOURCE, "typescript")
    # `private port` and `public label` declare fields; `unit` and `LIMIT` are fields.
    assert not {"port", "label", "unit", "LIMIT"} & set(found)
    assert set(found) == {"first", "third", "args", "shown", "scale", "sensor", "offset", "factor", "value",
                          "reading"}
    assert found["value"] == (LOCAL, [(12, 11), (13, 56)]), "the type literal's `value:` is not a use"


def test_exported_functions_have_public_parameters():
    source = analyse(SOURCE, "meter.ts", "typescript")
    public = {v.name for v in source.variables if v.public_parameter}
    assert public == {"first", "third", "args"}


def test_rename_changes_every_use_and_nothing_else():
    renamed = rename(SOURCE, "typescript", {"third": "fallback", "args": "names", "offset": "shift",
                                            "value": "level"})
    assert renamed.splitlines()[:2] == [
        "export function describe(first: string, fallback?: number, ...names: string[]): string {",
        "  const shown = fallback ?? names.length;",
    ]
    assert "read(sensor?: Sensor, { offset: shift, gain: factor }: Options = {}): Reading {" in renamed
    assert "const level = sensor!.value * factor + shift;" in renamed
    assert "const reading: { value: number; unit: string } = { value: level, unit: this.unit };" in renamed
