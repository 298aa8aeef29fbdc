import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { addBag, addCheck, addCount, addLot, addReading, addSowing, addStore } from "../support/season-rows";
import { GET as exportRoute } from "@/app/api/export/route";
import { GET as backupRoute } from "@/app/api/backup/route";

// Invented Bramblewick records in one farm, and a neighbour's records that must never show.

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let owner: TestMember;
let visitor: TestMember;
let other: TestMember;
const ids: Record<string, string> = {};

beforeAll(async () => {
  ctx = await freshDatabase();
  owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery" });
  visitor = await signedInMember(ctx.db, { role: "visitor", farmId: owner.farmId });
  const f = owner.farmId;
  ids.store = await addStore(ctx.db, f, { name: "Barn fridge" });
  await addReading(ctx.db, f, ids.store, "2026-11-20T06:00:00.000Z", 3.5);
  await addReading(ctx.db, f, ids.store, "2026-11-20T12:00:00.000Z", -1.25);
  const gone = await addReading(ctx.db, f, ids.store, "2026-11-20T18:00:00.000Z", 9);
  await ctx.db("readings").where({ id: gone }).update({ deleted_at: "2026-11-21T00:00:00.000Z" });
  ids.lot = await addLot(ctx.db, f, { species: "Echinacea purpurea", source: "Hillside Seed Co-op", year: 2025 });
  ids.bag = await addBag(ctx.db, f, { code: "BW7K2Q", lotId: ids.lot, storeId: ids.store, start: "2026-10-01", windowStart: "2026-10-29", windowEnd: "2026-10-29", pulledOn: "2026-10-30", sownOn: "2026-10-31" });
  await addCheck(ctx.db, f, ids.bag, "2026-10-08T08:15:00.000Z", { moisture: "dry", note: "=HYPERLINK(\"http://x\")" });
  await ctx.db("checks").where({ bag_id: ids.bag }).update({ actions: JSON.stringify(["added_water"]), checked_by: owner.userId });
  ids.sowing = await addSowing(ctx.db, f, ids.bag, "2026-10-31", 50);
  await addCount(ctx.db, f, ids.sowing, "2026-11-07", 12);
  await addCount(ctx.db, f, ids.sowing, "2026-11-14", 40);

  other = await signedInMember(ctx.db, { role: "owner", farmName: "Neighbour Farm" });
  const theirStore = await addStore(ctx.db, other.farmId, { name: "Neighbour freezer", kind: "freezer" });
  await addReading(ctx.db, other.farmId, theirStore, "2026-11-20T06:00:00.000Z", -18);
  const theirLot = await addLot(ctx.db, other.farmId, { species: "Secret species" });
  const theirBag = await addBag(ctx.db, other.farmId, { code: "ZZZZ99", lotId: theirLot, storeId: theirStore, start: "2026-10-01" });
  await addCheck(ctx.db, other.farmId, theirBag, "2026-10-08T08:00:00.000Z");
  const theirSowing = await addSowing(ctx.db, other.farmId, theirBag, "2026-11-01", 10);
  await addCount(ctx.db, other.farmId, theirSowing, "2026-11-08", 3);
});
afterAll(async () => ctx.cleanup());

async function download(member: TestMember | null, query: string) {
  const res = await exportRoute(memberRequest(`/api/export?${query}`, member), {} as never);
  // Keep the byte-order mark (Response.text() would drop it) to check that spreadsheets get it.
  const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(await res.arrayBuffer());
  return { res, text, table: Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }) };
}

describe("GET /api/export", () => {
  it("readings: a CSV download with a header row, the farm's own live readings only", async () => {
    const { res, text, table } = await download(visitor, "what=readings&format=csv");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="rimebook-bramblewick-native-nursery-readings-\d{4}-\d{2}-\d{2}\.csv"/);
    expect(text.startsWith("\uFEFFcold_store,kind,taken_at,temperature_c,origin,reading_id,store_id\r\n")).toBe(true);
    expect(table.data.map((r) => [r.cold_store, r.kind, r.taken_at, r.temperature_c])).toEqual([
      ["Barn fridge", "Fridge", "2026-11-20T06:00:00.000Z", "3.5"],
      ["Barn fridge", "Fridge", "2026-11-20T12:00:00.000Z", "-1.25"], // a negative number is data, not a formula
    ]);
    expect(text).not.toContain("Neighbour");
  });

  it("bags: code, species, state in the product's words, dates", async () => {
    const { table } = await download(owner, "what=bags");
    expect(table.data).toEqual([
      // The code as the label prints it (with the hyphen), so a spreadsheet and a label read alike.
      expect.objectContaining({ code: "BW7-K2Q", species: "Echinacea purpurea", lot_source: "Hillside Seed Co-op", state: "Sown", cold_store: "Barn fridge", medium: "Paper towel", start_date: "2026-10-01", window_opens: "2026-10-29", pulled_on: "2026-10-30", sown_on: "2026-10-31", bag_id: ids.bag }),
    ]);
  });

  it("bags: the window and state the phone shows, moved by cold lost in the fridge, beside the planned window", async () => {
    // A separate farm: a bag 20 days into the cold whose fridge sat at 15 °C for two whole days (hourly readings).
    const grower = await signedInMember(ctx.db, { role: "owner", farmName: "Warm Door Farm" });
    const f = grower.farmId;
    const day = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10);
    const store = await addStore(ctx.db, f, { name: "Shed fridge" });
    const lot = await addLot(ctx.db, f, { species: "Asclepias tuberosa" });
    await addBag(ctx.db, f, { code: "WD3K9P", lotId: lot, storeId: store, start: day(-20), windowStart: day(10), windowEnd: day(20) });
    const from = Date.parse(`${day(-20)}T00:00:00.000Z`);
    for (let h = 0; h <= 20 * 24 - 6; h++) {
      const warm = h >= 5 * 24 && h < 7 * 24;
      await addReading(ctx.db, f, store, new Date(from + h * 3_600_000).toISOString(), warm ? 15 : 3);
    }
    const { table } = await download(grower, "what=bags");
    // Two days lost in the cold (common practice: time above the band does not count towards the chilling).
    expect(table.data).toEqual([
      expect.objectContaining({ code: "WD3-K9P", state: "Chilling", planned_window_opens: day(10), planned_window_closes: day(20), window_opens: day(12), window_closes: day(22), cold_days_lost: "2" }),
    ]);
  });

  it("checks: findings and actions in words, who checked, and a note that cannot run as a spreadsheet formula", async () => {
    const { table } = await download(owner, "what=checks");
    expect(table.data).toHaveLength(1);
    expect(table.data[0]).toMatchObject({ bag_code: "BW7-K2Q", moisture: "Dry", mould: "Clean", sprouts: "None", actions: "Added a few drops", checked_by: "Test owner" });
    expect(table.data[0].note).toBe("'=HYPERLINK(\"http://x\")");
  });

  it("sowings and counts, with the germination % of each count (ISTA: 100·N/Nt)", async () => {
    const sowings = await download(owner, "what=sowings");
    expect(sowings.table.data).toEqual([expect.objectContaining({ sown_on: "2026-10-31", bag_code: "BW7-K2Q", seeds_sown: "50", cells: "72" })]);
    const counts = await download(owner, "what=counts");
    expect(counts.table.data.map((r) => [r.counted_on, r.days_after_sowing, r.germinated_total, r.germination_percent])).toEqual([
      ["2026-11-07", "7", "12", "24"],
      ["2026-11-14", "14", "40", "80"],
    ]);
    expect(counts.text).not.toContain("ZZZZ99");
  });

  it("adds °F beside °C for a farm that reads °F", async () => {
    await ctx.db("farms").where({ id: owner.farmId }).update({ temperature_unit: "F" });
    const { table } = await download(owner, "what=readings");
    expect(table.data.map((r) => r.temperature_f)).toEqual(["38.3", "29.8"]);
    await ctx.db("farms").where({ id: owner.farmId }).update({ temperature_unit: "C" });
  });

  it("an empty farm still gets the header row", async () => {
    const empty = await signedInMember(ctx.db, { role: "visitor" });
    const { res, text } = await download(empty, "what=sowings");
    expect(res.status).toBe(200);
    expect(text).toBe("\uFEFFsown_on,bag_code,species,tray,cells,seeds_sown,note,sowing_id,bag_id\r\n");
  });

  it("refuses an unknown kind or format (400) and strangers (401)", async () => {
    const bad = await download(owner, "what=passwords");
    expect(bad.res.status).toBe(400);
    expect(JSON.parse(bad.text).error.fields.what).toMatch(/Choose what to export/);
    expect((await download(owner, "what=bags&format=xlsx")).res.status).toBe(400);
    expect((await download(null, "what=bags")).res.status).toBe(401);
  });
});

describe("GET /api/backup", () => {
  const backup = (m: TestMember | null) => backupRoute(memberRequest("/api/backup", m), {} as never);

  it("gives the Owner every farm table as JSON, tombstones included, and nothing secret", async () => {
    const res = await backup(owner);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(/filename="rimebook-backup-bramblewick-native-nursery-\d{4}-\d{2}-\d{2}\.json"/);
    const text = await res.text();
    const body = JSON.parse(text);
    expect(body).toMatchObject({ format: "rimebook-farm-backup", version: 1, farm: { id: owner.farmId, name: "Bramblewick Native Nursery" } });
    expect(body.counts).toMatchObject({ readings: 3, bags: 1, checks: 1, sowings: 1, counts: 2, lots: 1, stores: 1 });
    expect(body.tables.readings.find((r: { deleted_at: string | null }) => r.deleted_at)).toBeTruthy();
    expect(body.tables.checks[0].actions).toEqual(["added_water"]); // JSON columns as values
    expect(body.members.map((m: { email: string; role: string }) => m.role).sort()).toEqual(["owner", "visitor"]);
    for (const secret of ["password_hash", "token_hash", "scrypt", owner.token]) expect(text).not.toContain(secret);
    expect(text).not.toContain("Neighbour");
    expect(text).not.toContain("Secret species");
  });

  it("is for the Owner only", async () => {
    const grower = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId });
    expect((await backup(grower)).status).toBe(403);
    expect((await backup(visitor)).status).toBe(403);
    expect((await backup(null)).status).toBe(401);
  });
});
