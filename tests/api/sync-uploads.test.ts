import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.hoisted(() => {
  process.env.UPLOAD_DIR = `${require("node:os").tmpdir()}/rimebook-uploads-route-${process.pid}`;
});

import fs from "node:fs";
import path from "node:path";
import type { Knex } from "knex";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { uuid } from "../support/sync";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import { POST as upload } from "@/app/api/uploads/route";
import { GET as photo } from "@/app/api/uploads/[id]/route";
import { photoLimits } from "@/lib/schemas/photo";
import { sniffImage } from "@/lib/server/storage";

// POST /api/uploads: images only (by content, not name), size-capped, stored under the farm.

const ctx = { params: Promise.resolve({}) };
const JPEG = [0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00];
const PNG = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13];
const WEBP = [...Buffer.from("RIFF"), 0x24, 0, 0, 0, ...Buffer.from("WEBPVP8 ")];

function form(fields: Record<string, string | Blob>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.append(k, v);
  return f;
}

describe("photo uploads", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let db: Knex;
  let helper: TestMember;
  let bagId: string;
  let checkId: string;

  const send = (member: TestMember | null, body: FormData) => upload(memberRequest("/api/uploads", member, { method: "POST", body }), ctx);

  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
    const grower = await signedInMember(db, { role: "grower" });
    helper = await signedInMember(db, { role: "helper", farmId: grower.farmId });
    const lotId = uuid();
    bagId = uuid();
    checkId = uuid();
    const at = "2026-11-20T08:00:00.000Z";
    const res = await push(
      memberRequest("/api/sync/push", grower, {
        method: "POST",
        json: {
          deviceId: "d",
          mutations: [
            { id: uuid(), name: "lot.create", args: { id: lotId, species: "Trillium grandiflorum" }, at },
            { id: uuid(), name: "bag.create", args: { id: bagId, code: "TG7Q2M-P", lot_id: lotId }, at },
            { id: uuid(), name: "check.record", args: { id: checkId, bag_id: bagId, checked_at: at, moisture: "damp", mould: "spots", sprouts: "none" }, at },
          ],
        },
      }),
      ctx,
    );
    expect((await res.json()).rejected).toEqual([]);
  });
  afterAll(async () => {
    await t.cleanup();
    fs.rmSync(process.env.UPLOAD_DIR!, { recursive: true, force: true });
  });

  it.each([
    ["JPEG", JPEG, "image/jpeg"],
    ["PNG", PNG, "image/png"],
    ["WebP", WEBP, "image/webp"],
    ["text", [...Buffer.from("hello, not a photo")], null],
    ["GIF", [...Buffer.from("GIF89a"), 1, 0, 1, 0], null],
  ] as const)("sniffs %s by its magic bytes", (_, bytes, expected) => {
    expect(sniffImage(new Uint8Array(bytes))).toBe(expected);
  });

  it("stores a real image under the farm, writes a synced photos row, and answers {id, url}", async () => {
    const id = uuid();
    const res = await send(helper, form({ id, bagId, checkId, file: new Blob([new Uint8Array([...JPEG, ...new Array(500).fill(7)])], { type: "text/plain" }), }));
    expect(res.status).toBe(201);
    expect(await res.json()).toEqual({ id, url: `/api/uploads/${id}` });
    const row = await db("photos").where({ id }).first();
    expect(row).toMatchObject({ farm_id: helper.farmId, bag_id: bagId, check_id: checkId, mime: "image/jpeg", bytes: 511, uploaded_by: helper.userId });
    expect(fs.existsSync(path.join(process.env.UPLOAD_DIR!, helper.farmId, `${id}.jpg`))).toBe(true);

    const again = await send(helper, form({ id, bagId, file: new Blob([new Uint8Array(JPEG)]) }));
    expect(again.status).toBe(201); // a retried upload is stored once
    expect(await db("photos").where({ id }).count({ n: "*" }).first()).toEqual({ n: 1 });

    const feed = await (await pull(memberRequest("/api/sync/pull?since=0&limit=100", helper), ctx)).json();
    const change = feed.changes.find((c: { table: string; row: { id: string } }) => c.table === "photos" && c.row.id === id);
    expect(change.row).toMatchObject({ url: `/api/uploads/${id}`, bag_id: bagId });
    expect(change.row).not.toHaveProperty("path");

    const got = await photo(memberRequest(`/api/uploads/${id}`, helper), { params: Promise.resolve({ id }) });
    expect(got.status).toBe(200);
    expect(got.headers.get("content-type")).toBe("image/jpeg");
    expect((await got.arrayBuffer()).byteLength).toBe(511);
  });

  it("answers 415 for a file that is not an image, whatever its name and type say", async () => {
    const res = await send(helper, form({ bagId, file: new File([new TextEncoder().encode("<svg onload=alert(1)>")], "photo.jpg", { type: "image/jpeg" }) }));
    expect(res.status).toBe(415);
    expect((await res.json()).error.code).toBe("unsupported_type");
  });

  it("answers 413 for a photo over the size cap", async () => {
    const big = new Uint8Array(photoLimits.maxBytes + 1);
    big.set(JPEG);
    const res = await send(helper, form({ bagId, file: new Blob([big], { type: "image/jpeg" }) }));
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe("too_large");
  });

  it("keeps farms apart and refuses Visitors and strangers", async () => {
    const stranger = await signedInMember(db, { role: "owner" });
    const foreignBag = await send(stranger, form({ bagId, file: new Blob([new Uint8Array(JPEG)]) }));
    expect(foreignBag.status).toBe(404);
    const [existing] = await db("photos").select("id");
    const foreignPhoto = await photo(memberRequest(`/api/uploads/${existing.id}`, stranger), { params: Promise.resolve({ id: existing.id }) });
    expect(foreignPhoto.status).toBe(404);
    const visitor = await signedInMember(db, { role: "visitor", farmId: helper.farmId });
    expect((await send(visitor, form({ bagId, file: new Blob([new Uint8Array(JPEG)]) }))).status).toBe(403);
    expect((await send(null, form({ bagId, file: new Blob([new Uint8Array(JPEG)]) }))).status).toBe(401);
    const missingFile = await send(helper, form({ bagId }));
    expect(missingFile.status).toBe(400);
  });
});
