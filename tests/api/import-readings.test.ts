import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { addReading, addStore } from "../support/season-rows";
import { POST } from "@/app/api/stores/[id]/readings/import/route";
import { pullChanges } from "@/lib/server/sync/pull";

// Route-handler tests on a fresh SQLite file: the real handler, the real database, no mocks.

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let owner: TestMember;
let grower: TestMember;
let storeId: string;

beforeAll(async () => {
  ctx = await freshDatabase();
  owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery" });
  grower = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId });
  storeId = await addStore(ctx.db, owner.farmId, { name: "Barn fridge" });
});
afterAll(async () => ctx.cleanup());

const params = (id: string) => ({ params: Promise.resolve({ id }) });

function upload(member: TestMember | null, id: string, body: BodyInit, opts: { query?: string; type?: string; headers?: Record<string, string> } = {}) {
  const path = `/api/stores/${id}/readings/import${opts.query ? `?${opts.query}` : ""}`;
  const headers: Record<string, string> = { ...(opts.headers ?? {}) };
  if (opts.type !== undefined) headers["content-type"] = opts.type;
  else if (!(body instanceof FormData)) headers["content-type"] = "text/csv";
  return POST(memberRequest(path, member, { method: "POST", body, headers }), params(id));
}

const readingsOf = (id: string) => ctx.db("readings").where({ store_id: id }).orderBy("taken_at");

describe("POST /api/stores/{id}/readings/import", () => {
  it("imports a good logger file: 201, every reading stored in °C with its own seq, so it syncs to phones", async () => {
    const before = Number((await ctx.db("farms").where({ id: owner.farmId }).first("seq")).seq);
    const csv = "Logger: barn 1\nSerial: BW-0042\nTime,Temperature (°C)\n2026-11-20 06:00,3.9\n2026-11-20 12:00,4.2\n2026-11-20 18:00,11.5\n";
    const res = await upload(grower, storeId, csv);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ dryRun: false, imported: 3, ok: true, counts: { rows: 3, ok: 3, errors: 0, duplicates: 0 }, store: { id: storeId, name: "Barn fridge" } });
    expect(body.message).toBe("Imported 3 readings.");
    const rows = await readingsOf(storeId);
    expect(rows.map((r) => [r.taken_at, r.temperature_c, r.origin])).toEqual([
      ["2026-11-20T06:00:00.000Z", 3.9, "import"],
      ["2026-11-20T12:00:00.000Z", 4.2, "import"],
      ["2026-11-20T18:00:00.000Z", 11.5, "import"],
    ]);
    const seqs = rows.map((r) => Number(r.seq));
    expect(new Set(seqs).size).toBe(3);
    expect(Math.min(...seqs)).toBe(before + 1);
    expect(Number((await ctx.db("farms").where({ id: owner.farmId }).first("seq")).seq)).toBe(before + 3);
    const page = await pullChanges(ctx.db, owner.farmId, before, 100);
    expect(page.changes.filter((c) => c.table === "readings")).toHaveLength(3);
  });

  it("converts °F named in the header (NIST SP 811: °C = (°F − 32)/1.8; FDA: 40 °F ≈ 4.4 °C)", async () => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Kitchen fridge" });
    const res = await upload(owner, store, "taken_at,temp_f\n2026-11-21 08:00,40\n2026-11-21 09:00,32\n2026-11-21 10:00,50\n");
    expect(res.status).toBe(201);
    expect((await res.json()).unit).toBe("F");
    expect((await readingsOf(store)).map((r) => r.temperature_c)).toEqual([4.44, 0, 10]);
  });

  it("reads °F from the unit option of a form upload (multipart, file field)", async () => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Shed fridge" });
    const form = new FormData();
    form.set("file", new Blob(["Time,Temperature\n2026-11-22 08:00,39.2\n"], { type: "text/csv" }), "shed.csv");
    form.set("unit", "F");
    const res = await upload(owner, store, form);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ imported: 1, unit: "F", unitSource: "option", fileName: "shed.csv" });
    expect((await readingsOf(store)).map((r) => r.temperature_c)).toEqual([4]);
  });

  it("previews with ?dryRun=1 and writes nothing", async () => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Preview fridge" });
    const res = await upload(owner, store, "Time,Temp C\n2026-11-23 08:00,4\n2026-11-23 09:00,4.1\n", { query: "dryRun=1" });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ dryRun: true, ok: true, toImport: 2, preview: [{ row: 2, takenAt: "2026-11-23T08:00:00.000Z", temperatureC: 4 }, { row: 3 }] });
    expect(await readingsOf(store)).toHaveLength(0);
  });

  it("mixed good and bad rows: 422, nothing imported, each bad row named in grower words", async () => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Mixed fridge" });
    const csv = "Time,Temperature (°C)\n2026-11-24 08:00,4\n2026-11-24 09:00,cold\n2026-11-31 10:00,4\n2026-11-24 11:00,4.2\n";
    const res = await upload(owner, store, csv);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("domain");
    expect(body.error.message).toBe("2 rows have problems, so no readings were imported. Fix them and import the file again.");
    expect(body.error.fields).toEqual({ "row 3": expect.stringContaining("not a temperature"), "row 4": "November 2026 has no day 31." });
    expect(body.report.rows).toEqual([
      { row: 3, status: "error", message: expect.any(String) },
      { row: 4, status: "error", message: "November 2026 has no day 31." },
    ]);
    expect(body.report.counts).toEqual({ rows: 4, ok: 2, errors: 2, duplicates: 0 });
    expect(await readingsOf(store)).toHaveLength(0);
  });

  it("ambiguous day/month order: 422 asking for a choice; with ?dateOrder=dmy it imports", async () => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Order fridge" });
    const csv = "Time,Temp C\n03/11/2026 08:00,4\n04/11/2026 08:00,4\n";
    const refused = await upload(owner, store, csv);
    expect(refused.status).toBe(422);
    expect((await refused.json()).error.message).toMatch(/could mean 3 April or March 4.*Nothing was imported/);
    const res = await upload(owner, store, csv, { query: "dateOrder=dmy" });
    expect(res.status).toBe(201);
    expect((await readingsOf(store)).map((r) => r.taken_at)).toEqual(["2026-11-03T08:00:00.000Z", "2026-11-04T08:00:00.000Z"]);
  });

  it("ignores and counts duplicates: in the file, already imported, and already typed at a check in another offset", async () => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Twin fridge" });
    await addReading(ctx.db, owner.farmId, store, "2026-11-25T09:00:00+01:00", 4.0); // = 08:00Z
    const csv = "Time,Temp C\n2026-11-25 07:00,3.8\n2026-11-25 08:00,4.1\n2026-11-25 07:00,3.9\n2026-11-25 09:00,4.4\n";
    const first = await upload(owner, store, csv);
    expect(first.status).toBe(201);
    const body = await first.json();
    expect(body).toMatchObject({ imported: 2, counts: { rows: 4, ok: 2, errors: 0, duplicates: 2 } });
    expect(body.rows).toEqual([
      { row: 3, status: "duplicate", message: "Already recorded; skipped." },
      { row: 4, status: "duplicate", message: "Same time as row 2; the first was kept." },
    ]);
    expect(await readingsOf(store)).toHaveLength(3);

    const again = await upload(owner, store, csv);
    expect(again.status).toBe(200);
    const againBody = await again.json();
    expect(againBody).toMatchObject({ imported: 0, counts: { duplicates: 4 } });
    expect(againBody.message).toBe("Nothing new: all 4 readings were already recorded.");
    expect(await readingsOf(store)).toHaveLength(3);
  });

  it.each([
    ["Windows-1252 text (° saved as a single byte)", new Uint8Array([...new TextEncoder().encode("Time,Temp "), 0xb0, ...new TextEncoder().encode("C\n2026-11-26 08:00,4\n")]), /not saved as UTF-8/],
    ["a picture", new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52]), /not a text CSV/],
    ["a spreadsheet workbook", new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0]), /workbook/],
  ])("refuses %s with 415 and a clear message, writing nothing", async (_name, bytes, words) => {
    const store = await addStore(ctx.db, owner.farmId, { name: "Encoding fridge" });
    const res = await upload(owner, store, bytes as BodyInit);
    expect(res.status).toBe(415);
    const body = await res.json();
    expect(body.error.code).toBe("unsupported_type");
    expect(body.error.message).toMatch(words);
    expect(await readingsOf(store)).toHaveLength(0);
  });

  it("refuses a JSON body with 415", async () => {
    const res = await upload(owner, storeId, JSON.stringify({ readings: [] }), { type: "application/json" });
    expect(res.status).toBe(415);
  });

  it("refuses a file over 5 MB with 413, whether or not the size is declared", async () => {
    const line = "2026-11-27 08:00,4.0\n";
    const huge = "Time,Temp C\n" + line.repeat(Math.ceil((5 * 1024 * 1024) / line.length) + 10);
    const declared = await upload(owner, storeId, huge, { headers: { "content-length": String(new TextEncoder().encode(huge).length) } });
    expect(declared.status).toBe(413);
    // Streamed without a length: refused while reading, before it is all held in memory.
    const stream = new ReadableStream<Uint8Array>({
      start(controller) {
        const chunk = new TextEncoder().encode(line.repeat(10_000));
        for (let sent = 0; sent < 6 * 1024 * 1024; sent += chunk.length) controller.enqueue(chunk);
        controller.close();
      },
    });
    const streamed = await POST(
      new Request(new URL(`/api/stores/${storeId}/readings/import`, "http://localhost:3000"), {
        method: "POST",
        body: stream,
        headers: { ...owner.headers, "content-type": "text/csv" },
        duplex: "half",
      } as RequestInit),
      params(storeId),
    );
    expect(streamed.status).toBe(413);
    expect((await streamed.json()).error.message).toMatch(/larger than 5 MB/);
  });

  it("answers 404 for another farm's store, a missing store and a malformed id", async () => {
    const other = await signedInMember(ctx.db, { role: "owner", farmName: "Elsewhere Farm" });
    const theirs = await addStore(ctx.db, other.farmId, { name: "Their fridge" });
    const csv = "Time,Temp C\n2026-11-28 08:00,4\n";
    for (const id of [theirs, "8f0a7a4e-2b7c-4a55-9a31-1f1c0b6a7d11", "not-an-id"]) {
      const res = await upload(owner, id, csv);
      expect(res.status).toBe(404);
      expect((await res.json()).error.message).toBe("That cold store was not found.");
    }
    expect(await readingsOf(theirs)).toHaveLength(0);
  });

  it("refuses Helpers and Visitors (403), strangers (401) and other origins (403)", async () => {
    const csv = "Time,Temp C\n2026-11-29 08:00,4\n";
    for (const role of ["helper", "visitor"] as const) {
      const m = await signedInMember(ctx.db, { role, farmId: owner.farmId });
      expect((await upload(m, storeId, csv)).status).toBe(403);
    }
    expect((await upload(null, storeId, csv)).status).toBe(401);
    expect((await upload(owner, storeId, csv, { headers: { origin: "https://evil.example" } })).status).toBe(403);
    expect(await ctx.db("readings").where({ store_id: storeId, taken_at: "2026-11-29T08:00:00.000Z" })).toHaveLength(0);
  });
});
