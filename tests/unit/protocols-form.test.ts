import { describe, expect, it } from "vitest";
import { Protocol } from "@/lib/schemas/protocol";
import { starterProtocols } from "@/lib/domain/starter-protocols";
import { blankPhase, copyToFarmOwn, fromFormValues, readBandFields, toFormValues } from "@/components/protocols/protocol-form-values";
import { makeStarterRow } from "./bags-fixtures";

describe("readBandFields", () => {
  it.each([
    [{ minC: null, maxC: null }, null],
    [{ minC: 1, maxC: 5 }, { minC: 1, maxC: 5 }],
    // "at 5 °C" (Kaye et al. 2018 rows): one end typed stands for both
    [{ minC: 5, maxC: null }, { minC: 5, maxC: 5 }],
    [{ minC: null, maxC: 10 }, { minC: 10, maxC: 10 }],
    [{ minC: Number.NaN, maxC: Number.NaN }, null],
    [{ minC: -18, maxC: -18 }, { minC: -18, maxC: -18 }],
  ])("%j → %j", (fields, band) => {
    expect(readBandFields(fields)).toEqual(band);
  });
});

describe("form values round trip", () => {
  it.each(starterProtocols.map((s) => [s.key, s] as const))("%s survives the form unchanged (but becomes the farm's own)", (_k, starter) => {
    const { key: _key, citations: _c, ...protocol } = starter;
    const back = Protocol.parse(fromFormValues(toFormValues(protocol)));
    expect(back).toEqual({ ...Protocol.parse(protocol), isFarmOwn: true });
  });

  it("a blank maximum means no upper limit; a blank minimum is refused in words", () => {
    const v = toFormValues({ species: "Allium tricoccum", phases: [], effectiveBand: null, noColdReason: "", toxicSeed: null, medicinal: false, note: "", commonName: "" });
    v.phases.push(blankPhase());
    v.phases[0].sources[0] = { citation: "Own records 2025", minDays: 60, maxDays: null, band: { minC: null, maxC: null }, note: "" };
    expect(Protocol.parse(fromFormValues(v)).phases[0].sources[0]).toMatchObject({ minDays: 60, maxDays: null, band: null });
    v.phases[0].sources[0].minDays = null;
    const r = Protocol.safeParse(fromFormValues(v));
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]).toMatchObject({ path: ["phases", 0, "sources", 0, "minDays"], message: "Enter a number of days." });
  });

  it("a step without days (scarify) reads blank days as zero, since the form hides them", () => {
    const v = toFormValues({ species: "Baptisia australis", phases: [], effectiveBand: null, noColdReason: "", toxicSeed: null, medicinal: false, note: "", commonName: "" });
    v.phases.push({ kind: "scarify", note: "Nick the coat", sources: [{ citation: "Own records", minDays: null, maxDays: null, band: { minC: null, maxC: null }, note: "" }] });
    expect(Protocol.parse(fromFormValues(v)).phases[0].sources[0]).toMatchObject({ minDays: 0, maxDays: 0 });
  });

  it("a cold phase without a source is refused, pointing at its sources", () => {
    const v = toFormValues({ species: "X y", phases: [{ kind: "cold_moist", note: "", sources: [] }], effectiveBand: null, noColdReason: "", toxicSeed: null, medicinal: false, note: "", commonName: "" });
    const r = Protocol.safeParse(fromFormValues(v));
    expect(r.error?.issues[0].path).toEqual(["phases", 0, "sources"]);
  });
});

describe("copyToFarmOwn", () => {
  it("keeps the published sources and cautions, takes a new id and drops the starter key", () => {
    const row = makeStarterRow("sambucus"); // Young & Young 1992: 90 days warm, then 90 cold; elder flag CDC MMWR 1984
    const copy = copyToFarmOwn(row, "11111111-1111-4111-8111-111111111111");
    expect(copy).toMatchObject({ id: "11111111-1111-4111-8111-111111111111", isFarmOwn: true, starter_key: null, species: "Sambucus spp.", medicinal: true });
    expect(copy.phases.flatMap((p) => (p.sources ?? []).map((s) => [s.citation, s.minDays, s.maxDays]))).toEqual([
      ["Young & Young 1992, Seeds of Woody Plants in North America", 90, 90],
      ["Young & Young 1992, Seeds of Woody Plants in North America", 90, 90],
    ]);
    expect(copy.toxicSeed?.citation).toContain("MMWR 1984");
    expect(copy.note).toBe("Copied from the published starter row; its sources are kept.");
    expect(Protocol.safeParse(copy).success).toBe(true);
  });
});
