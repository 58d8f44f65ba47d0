"""TypeScript: optional, rest and property parameters, non-null assertions, type literals; worked by hand."""

from cognomen.model.corpus import analyse
from cognomen.model.scopes import LOCAL, PARAMETER

from .snippets import cues, rename, variables

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


# zod 4.1.12 (npm, src/): v3/types.ts:86 returns an object type before its body, v4/core/schemas.ts:282
# reads `payload.value` after a key, v4/locales/zh-CN.ts:6 annotates with `Record<string, { unit: string }>`,
# v4/core/schemas.ts:2752 names a parameter `final` with a `Map<unknown, unknown>>` type, v4/locales/lt.ts:61
# a parameter `number: number`, v4/core/api.ts:1323 a getter named like a parameter, v3/ZodError.ts:271
# `asserts value is T`, v4/core/util.ts:790 `message?.message`.
ZOD_SHAPES = """\
const handle = <Out>(ctx: Context, result: Result<Out>): { ok: true; data: Out } | { ok: false } => {
  const sizes: Record<string, { unit: string; verb: string }> = { string: { unit: "chars", verb: "has" } };
  return result.ok ? { ok: true, data: result.value } : { ok: false, issues: ctx.issues, size: sizes };
};
function merge(final: Payload<Map<unknown, unknown>>, number: number, params?: Params): number {
  final.value = { value: final.value, async: params?.async };
  const { minimum } = final.bag as { minimum?: number };
  return number + (minimum ?? 0);
}
function withDefault(defaultValue: number, message: string | { message: string }) {
  return { get defaultValue() { return defaultValue; }, text: typeof message === "string" ? message : message?.message };
}
function check(value: unknown): asserts value is string {
  if (typeof value !== "string") throw new Error();
}
"""


def test_zod_shapes_worked_by_hand():
    found = variables(ZOD_SHAPES, "typescript")
    assert set(found) == {"ctx", "result", "sizes", "final", "number", "params", "minimum", "defaultValue",
                          "message", "value"}, "`string`, `unit` and `verb` in a type annotation are no variables"
    assert found["result"] == (PARAMETER, [(1, 36), (3, 10), (3, 40)]), "the object return type is no body"
    assert found["final"] == (PARAMETER, [(5, 16), (6, 3), (6, 26), (7, 23)]), \
        "`payload.value` after a key, and a name older editions reserved"
    assert found["number"] == (PARAMETER, [(5, 55), (8, 10)]), "the types `number` are no uses"
    assert found["params"] == (PARAMETER, [(5, 71), (6, 46)])
    assert found["minimum"] == (LOCAL, [(7, 11), (8, 20)]), "`as { minimum?: number }` is a type"
    assert found["defaultValue"] == (PARAMETER, [(10, 22), (11, 40)]), "a getter's name is a key"
    assert found["message"] == (PARAMETER, [(10, 44), (11, 70), (11, 93), (11, 103)])
    assert found["value"] == (PARAMETER, [(13, 16), (13, 41), (14, 14)]), "`asserts value` names the parameter"
    renamed = rename(ZOD_SHAPES, "typescript", {"final": "target", "message": "note"})
    assert "  target.value = { value: target.value, async: params?.async };" in renamed
    assert "typeof note === \"string\" ? note : note?.message }" in renamed


def test_flow_cues_worked_by_hand():
    found = cues(SOURCE, "meter.ts", "typescript")
    assert {"parameter:describe#1", "type:number"} <= found["third"]
    assert "type:many string" in found["args"], "`...args: string[]`"
    assert {"parameter:read#0", "type:Sensor"} <= found["sensor"]
    assert "keyword:gain" in found["factor"], "`{ offset, gain: factor }` binds what `gain` holds"
    assert "returned:read" in found["reading"]
    assert not any(cue.startswith("call:") for cue in found["value"]), "`sensor!.value` is no call"
