import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { addLot, addProtocol } from "../support/season-rows";
import { POST } from "@/app/api/lots/import/route";

// Invented lots of the demo nursery; the real handler on a fresh SQLite file.

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let owner: TestMember;

beforeAll(async () => {
  ctx = await freshDatabase();
  owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery" });
});
afterAll(async () => ctx.cleanup());

function upload(member: TestMember | null, body: BodyInit, query = "", type = "text/csv") {
  const headers: Record<string, string> = body instanceof FormData ? {} : { "content-type": type };
  return POST(memberRequest(`/api/lots/import${query}`, member, { method: "POST", body, headers }), {} as never);
}
const lotsOf = (farmId: string) => ctx.db("lots").where({ farm_id: farmId }).orderBy("species");

describe("POST /api/lots/import", () => {
  it("imports a good sheet: 201, lots with seq, linked to the farm's protocol for their species", async () => {
    const protocolId = await addProtocol(ctx.db, owner.farmId, "Echinacea purpurea", [28, 28]);
    const before = Number((await ctx.db("farms").where({ id: owner.farmId }).first("seq")).seq);
    const csv = [
      "Species,Common name,Source,Year,Quantity,Treated,Notes",
      "Echinacea purpurea,Purple coneflower,Hillside Seed Co-op,2025,\"1,500\",no,",
      "Baptisia australis,Blue false indigo,Bramblewick hedgerow,2024,220,yes,Keep apart from food",
    ].join("\n");
    const res = await upload(owner, csv);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ imported: 2, counts: { rows: 2, ok: 2, errors: 0, duplicates: 0 } });
    const lots = await lotsOf(owner.farmId);
    expect(lots.map((l) => [l.species, l.source, l.year, l.quantity, Boolean(l.treated), l.protocol_id])).toEqual([
      ["Baptisia australis", "Bramblewick hedgerow", 2024, 220, true, null],
      ["Echinacea purpurea", "Hillside Seed Co-op", 2025, 1500, false, protocolId],
    ]);
    expect(lots.map((l) => Number(l.seq)).sort()).toEqual([before + 1, before + 2]);
  });

  it("previews with ?dryRun=1 (form upload) and writes nothing", async () => {
    const farm = await signedInMember(ctx.db, { role: "grower" });
    const form = new FormData();
    form.set("file", new Blob(["Botanical name;Seed count\nFragaria vesca;800\n"]), "lots.csv");
    form.set("dryRun", "1");
    const res = await upload(farm, form);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ dryRun: true, toImport: 1, preview: [{ row: 2, lot: { species: "Fragaria vesca", quantity: 800 } }], fileName: "lots.csv" });
    expect(await lotsOf(farm.farmId)).toHaveLength(0);
  });

  it("mixed good and bad rows: 422 with a report per row, nothing imported", async () => {
    const farm = await signedInMember(ctx.db, { role: "owner" });
    const csv = "Species,Year,Quantity\nAllium tricoccum,2025,50\n,2025,10\nSambucus nigra,last year,5\n";
    const res = await upload(farm, csv);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.fields).toEqual({ "row 3": "Species: Name the species.", "row 4": "Year: “last year” is not a whole number." });
    expect(body.report.counts).toEqual({ rows: 3, ok: 1, errors: 2, duplicates: 0 });
    expect(await lotsOf(farm.farmId)).toHaveLength(0);
  });

  it("skips and counts lots already on the farm and twins in the file", async () => {
    const farm = await signedInMember(ctx.db, { role: "owner" });
    await addLot(ctx.db, farm.farmId, { species: "Asclepias syriaca", source: "Bramblewick hedgerow", year: 2025, quantity: 400 });
    const csv = "Species,Source,Year,Quantity\nasclepias syriaca,Bramblewick Hedgerow,2025,400\nHypericum perforatum,Meadow,2025,900\nHypericum perforatum,Meadow,2025,900\n";
    const res = await upload(farm, csv);
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({ imported: 1, counts: { ok: 1, duplicates: 2 } });
    expect((await lotsOf(farm.farmId)).map((l) => l.species)).toEqual(["Asclepias syriaca", "Hypericum perforatum"]);
  });

  it("refuses a file that is not UTF-8 text (415) and one over 5 MB (413)", async () => {
    const latin1 = new Uint8Array([...new TextEncoder().encode("Species,Source\nAchillea millefolium,Caf"), 0xe9, 0x0a]);
    expect((await upload(owner, latin1 as BodyInit)).status).toBe(415);
    const huge = "Species\n" + "Achillea millefolium\n".repeat(300_000);
    expect((await upload(owner, huge)).status).toBe(413);
  });

  it("is for Growers and Owners only", async () => {
    for (const role of ["helper", "visitor"] as const) {
      const m = await signedInMember(ctx.db, { role, farmId: owner.farmId });
      const res = await upload(m, "Species\nAchillea millefolium\n");
      expect(res.status).toBe(403);
    }
    expect((await upload(null, "Species\nAchillea millefolium\n")).status).toBe(401);
    expect(await ctx.db("lots").where({ species: "Achillea millefolium" })).toHaveLength(0);
  });
});
