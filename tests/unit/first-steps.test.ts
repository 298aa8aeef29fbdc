import { describe, expect, it } from "vitest";
import { listFirstSteps } from "@/components/today/first-steps";

// Product rule (PRODUCT.md, the whole job): a bag needs somewhere cold and a seed lot before it can be set up.
describe("a new farm's first steps", () => {
  const state = (f: { stores: number; lots: number; bags: number }) =>
    listFirstSteps(f)?.map((s) => `${s.key}${s.done ? ":done" : ""}${s.next ? ":next" : ""}`) ?? null;
  it.each([
    [{ stores: 0, lots: 0, bags: 0 }, ["store:next", "lot", "bag", "label"]],
    [{ stores: 1, lots: 0, bags: 0 }, ["store:done", "lot:next", "bag", "label"]],
    [{ stores: 0, lots: 2, bags: 0 }, ["store:next", "lot:done", "bag", "label"]],
    [{ stores: 1, lots: 1, bags: 0 }, ["store:done", "lot:done", "bag:next", "label"]],
    [{ stores: 1, lots: 1, bags: 1 }, null],
  ])("%j → %j", (f, want) => {
    expect(state(f)).toEqual(want);
  });
});
