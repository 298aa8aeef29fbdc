import { describe, expect, it } from "vitest";
import { emptyToNull, numberOrNull, pickChanged } from "@/components/bags/form-values";

describe("form value readers", () => {
  it.each([
    ["", null],
    ["   ", null],
    [undefined, null],
    ["Box A", "Box A"],
    [null, null],
    [0, 0],
  ])("emptyToNull(%j) = %j", (input, want) => {
    expect(emptyToNull(input)).toBe(want);
  });

  it.each([
    ["", null],
    [null, null],
    [undefined, null],
    ["0", 0],
    ["42", 42],
    ["4.5", 4.5],
    ["-18", -18],
  ])("numberOrNull(%j) = %j", (input, want) => {
    expect(numberOrNull(input)).toBe(want);
  });

  it("numberOrNull leaves nonsense as NaN for the schema to refuse", () => {
    expect(numberOrNull("abc")).toBeNaN();
  });

  it.each([
    [{ box: "B", note: "x", medium: "sand" }, { box: true }, { box: "B" }],
    [{ box: "B", note: null }, { box: true, note: true }, { box: "B", note: null }],
    [{ box: "B" }, {}, {}],
    [{ box: "B" }, { box: false }, {}],
  ])("pickChanged(%j, %j)", (values, dirty, want) => {
    expect(pickChanged(values as Record<string, unknown>, dirty)).toEqual(want);
  });
});
