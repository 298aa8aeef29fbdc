import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { seed } from "@/db/seeds/01_demo_farm";
import { demoFarm } from "@/db/seeds/data/demo-farm";
import { backupTables } from "@/lib/server/exports";
import { readPhotoFile, savePhotoFile } from "@/lib/server/storage";
import { GET as backupRoute } from "@/app/api/backup/route";
import { POST as restoreRoute } from "@/app/api/backup/restore/route";

// The demo farm (invented: Bramblewick Native Nursery) with one photo, backed up with its pictures and restored into
// a new farm on the same server: new ids, same codes, every table's rows, and refusals that change nothing.

process.env.UPLOAD_DIR = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-restore-uploads-"));

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let source: TestMember;
let backup: Record<string, any>;
const png = fs.readFileSync(path.resolve("public/icons/rimebook-192.png"));

const restore = (m: TestMember, body: string) => restoreRoute(memberRequest("/api/backup/restore", m, { method: "POST", body, headers: { "content-type": "application/json" } }), {} as never);
const countRows = async (farmId: string) =>
  Object.fromEntries(await Promise.all(backupTables.map(async (t) => [t, Number((await ctx.db(t).where({ farm_id: farmId }).count({ n: "*" }))[0].n)] as const)));
const newFarm = () => signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick on the hosted server", starters: true });

beforeAll(async () => {
  ctx = await freshDatabase();
  await seed(ctx.db);
  source = await signedInMember(ctx.db, { role: "owner", farmId: demoFarm.id, email: "wren.restore@bramblewick.example" });
  // One check photo, stored as the upload route stores it.
  const bag = await ctx.db("bags").where({ farm_id: demoFarm.id }).first("id");
  const check = await ctx.db("checks").where({ bag_id: bag.id }).first("id");
  const photoId = randomUUID();
  const rel = await savePhotoFile(demoFarm.id, photoId, "image/png", png);
  const at = new Date().toISOString();
  const farm = await ctx.db("farms").where({ id: demoFarm.id }).first("seq");
  await ctx.db("photos").insert({ id: photoId, farm_id: demoFarm.id, bag_id: bag.id, check_id: check?.id ?? null, path: rel, mime: "image/png", bytes: png.length, uploaded_by: source.userId, created_at: at, updated_at: at, seq: Number(farm.seq) + 1, deleted_at: null });
  await ctx.db("farms").where({ id: demoFarm.id }).update({ seq: Number(farm.seq) + 1 });
  const res = await backupRoute(memberRequest("/api/backup?photos=1", source), {} as never);
  expect(res.status).toBe(200);
  backup = await res.json();
});
afterAll(async () => {
  await ctx.cleanup();
  fs.rmSync(process.env.UPLOAD_DIR!, { recursive: true, force: true });
});

describe("POST /api/backup/restore", () => {
  it("the backup with photos carries the pictures and names its database version", () => {
    expect(backup).toMatchObject({ format: "rimebook-farm-backup", version: 1, schema: expect.stringMatching(/^\d{14}_/), withPhotos: true });
    expect(Buffer.from(backup.tables.photos[0].data, "base64").equals(png)).toBe(true);
    expect(backup.tables.bags.length).toBeGreaterThan(10);
  });

  it("restores every table into a new farm: same counts, same codes, new ids, references followed, photos back", async () => {
    const target = await newFarm();
    const res = await restore(target, JSON.stringify(backup));
    expect(res.status).toBe(200);
    const report = await res.json();
    expect(report.photosWithoutPicture).toBe(0);
    expect(report.membersToInvite.map((m: { email: string }) => m.email)).toEqual(expect.arrayContaining(["wren@bramblewick.example", "ada@bramblewick.example"]));

    // Table by table, the same number of rows as the backup holds (tombstones included).
    expect(await countRows(target.farmId)).toEqual(Object.fromEntries(backupTables.map((t) => [t, backup.tables[t].length])));
    // The original farm is untouched.
    expect((await countRows(demoFarm.id)).bags).toBe(backup.tables.bags.length);

    const bags = await ctx.db("bags").where({ farm_id: target.farmId }).select("id", "code", "lot_id");
    expect(bags.map((b) => b.code).sort()).toEqual(backup.tables.bags.map((b: { code: string }) => b.code).sort());
    const oldIds = new Set(backupTables.flatMap((t) => backup.tables[t].map((r: { id?: string }) => r.id)).filter(Boolean));
    expect(bags.some((b) => oldIds.has(b.id))).toBe(false);
    // Every bag's lot and every check's bag are rows of the new farm.
    const lots = new Set((await ctx.db("lots").where({ farm_id: target.farmId }).select("id")).map((l) => l.id));
    expect(bags.every((b) => lots.has(b.lot_id))).toBe(true);
    const bagIds = new Set(bags.map((b) => b.id));
    const checks = await ctx.db("checks").where({ farm_id: target.farmId }).select("bag_id", "checked_by");
    expect(checks.every((c) => bagIds.has(c.bag_id))).toBe(true);
    // People of the old farm have no account here: their checks stay, "who" left blank.
    expect(checks.every((c) => c.checked_by === null)).toBe(true);

    const photo = await ctx.db("photos").where({ farm_id: target.farmId }).first();
    expect(photo.path.startsWith(target.farmId)).toBe(true);
    expect((await readPhotoFile(photo.path)).equals(png)).toBe(true);

    // Farm settings come along; the new farm's change counter is above every restored row (the phone pulls them all).
    const farm = await ctx.db("farms").where({ id: target.farmId }).first();
    expect(farm).toMatchObject({ name: backup.farm.name, timezone: backup.farm.timezone, last_frost_date: backup.farm.last_frost_date });
    const top = await ctx.db("bags").where({ farm_id: target.farmId }).max({ m: "seq" });
    expect(Number(farm.seq)).toBeGreaterThanOrEqual(Number(top[0].m));

    // A second restore into the now full farm is refused.
    const again = await restore(target, JSON.stringify(backup));
    expect(again.status).toBe(409);
    expect((await again.json()).error.message).toMatch(/already has records.*new, empty farm/);
  });

  it("a backup made before the read-only role was renamed lists that member to invite again as a Visitor", async () => {
    const old = structuredClone(backup);
    old.schema = "20261204130000_push_reminders";
    old.members = old.members.map((m: { role: string }) => (m.role === "visitor" ? { ...m, role: "viewer" } : m));
    expect(old.members.some((m: { role: string }) => m.role === "viewer")).toBe(true);
    const res = await restore(await newFarm(), JSON.stringify(old));
    expect(res.status).toBe(200);
    const { membersToInvite } = await res.json();
    expect(membersToInvite).toContainEqual(expect.objectContaining({ email: "juniper@bramblewick.example", role: "visitor" }));
    expect(JSON.stringify(membersToInvite)).not.toMatch(/viewer/);
  });

  it("refuses a file that is not a Rimebook backup, or one from a newer version, and changes nothing", async () => {
    const target = await newFarm();
    const before = await countRows(target.farmId);
    const cases: [string, number, RegExp][] = [
      ["this is a spreadsheet, not json", 422, /not a Rimebook farm backup/],
      [JSON.stringify({ hello: "world" }), 422, /not a Rimebook farm backup/],
      [JSON.stringify({ ...backup, format: "some-other-app" }), 422, /not a Rimebook farm backup/],
      [JSON.stringify({ ...backup, version: 2 }), 422, /newer version of Rimebook.*format 2/],
      [JSON.stringify({ ...backup, schema: "29991231000000_future" }), 422, /newer version of Rimebook.*29991231000000_future/],
    ];
    for (const [body, status, message] of cases) {
      const res = await restore(target, body);
      expect(res.status).toBe(status);
      expect((await res.json()).error.message).toMatch(message);
    }
    expect(await countRows(target.farmId)).toEqual(before);
  });

  it("a damaged record late in the file leaves nothing half-restored (one transaction), pictures removed again", async () => {
    const target = await newFarm();
    const before = await countRows(target.farmId);
    const damaged = structuredClone(backup);
    damaged.tables.counts.at(-1).counted_on = null; // NOT NULL: fails after every earlier table went in
    const res = await restore(target, JSON.stringify(damaged));
    expect(res.status).toBe(422);
    expect((await res.json()).error.message).toMatch(/counts could not be restored.*Nothing was changed/);
    expect(await countRows(target.farmId)).toEqual(before);
    expect(fs.existsSync(path.join(process.env.UPLOAD_DIR!, target.farmId)) ? fs.readdirSync(path.join(process.env.UPLOAD_DIR!, target.farmId)) : []).toEqual([]);
  });

  it("is for the Owner only", async () => {
    const target = await newFarm();
    const grower = await signedInMember(ctx.db, { role: "grower", farmId: target.farmId });
    expect((await restore(grower, JSON.stringify(backup))).status).toBe(403);
  });
});
