import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { uuid } from "../support/sync";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import type { MutationName } from "@/lib/schemas/mutations";

// Pull pages: the same rows whatever the page size, a change's rows (a row and its audit trail share one seq)
// never split across pages, and no empty extra page when the last page happens to be full.

const ctx = { params: Promise.resolve({}) };
const at = "2026-11-20T08:00:00.000Z";
const mutation = (name: MutationName, args: unknown) => ({ id: uuid(), name, args, at });
type Change = { table: string; row: Record<string, unknown> };
type Page = { cursor: number; changes: Change[]; more: boolean; head: number };

async function pushAs(member: TestMember, mutations: unknown[]) {
  const res = await push(memberRequest("/api/sync/push", member, { method: "POST", json: { deviceId: "device-1", mutations } }), ctx);
  const body = await res.json();
  expect(res.status, JSON.stringify(body)).toBe(200);
  expect(body.rejected).toEqual([]);
}

async function pullAll(member: TestMember, since: number, limit: number): Promise<Page[]> {
  const pages: Page[] = [];
  for (;;) {
    const res = await pull(memberRequest(`/api/sync/pull?since=${since}&limit=${limit}`, member), ctx);
    expect(res.status).toBe(200);
    const page = (await res.json()) as Page;
    pages.push(page);
    since = page.cursor;
    if (!page.more) return pages;
    expect(pages.length).toBeLessThan(500);
  }
}

const key = (c: Change) => `${c.table}:${String(c.row.id)}`;
const seqOf = (c: Change) => Number(c.row.seq);

describe("sync pull pages", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let db: Knex;
  let owner: TestMember;
  let head = 0;

  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
    owner = await signedInMember(db, { role: "owner" });
    // 40 lots, each then edited in three fields (the lot row and three audit rows share the edit's seq),
    // 30 bags, 60 checks, and the ten lots without bags deleted: several tables interleaved in seq order.
    const lots = Array.from({ length: 40 }, (_, i) => uuid());
    await pushAs(owner, lots.map((id, i) => mutation("lot.create", { id, species: `Species ${i}`, year: 2025, quantity: 100 + i })));
    await pushAs(owner, lots.map((id, i) => mutation("lot.update", { id, patch: { species: `Species ${i} (renamed)`, year: 2024, quantity: 200 + i } })));
    const bags = Array.from({ length: 30 }, (_, i) => ({ id: uuid(), code: `P${String(i).padStart(5, "0")}-K`, lot_id: lots[i % lots.length], start_date: "2026-11-01" }));
    await pushAs(owner, bags.map((b) => mutation("bag.create", b)));
    await pushAs(owner, Array.from({ length: 60 }, (_, i) => mutation("check.record", { id: uuid(), bag_id: bags[i % bags.length].id, checked_at: new Date(Date.UTC(2026, 10, 2, 0, i)).toISOString(), moisture: "damp", mould: "clean", sprouts: "none", actions: [] })));
    await pushAs(owner, lots.slice(30).map((id) => mutation("lot.delete", { id })));
    head = Number((await db("farms").where({ id: owner.farmId }).first("seq")).seq);
  });
  afterAll(async () => t.cleanup());

  it("answers the same rows page by page at limits 7, 100 and 5,000, never splitting a seq and never sending an empty page", async () => {
    const byLimit = new Map<number, Page[]>();
    for (const limit of [7, 100, 5000]) byLimit.set(limit, await pullAll(owner, 0, limit));
    if (process.env.PULL_PAGES_DUMP) fs.writeFileSync(process.env.PULL_PAGES_DUMP, JSON.stringify(Object.fromEntries(byLimit)));
    const all = byLimit.get(5000)!;
    expect(all).toHaveLength(1);
    const reference = all[0].changes;
    // Some rows do share a seq (the edits' audit trail), so the test covers them.
    expect(new Set(reference.map(seqOf)).size).toBeLessThan(reference.length);
    for (const [limit, pages] of byLimit) {
      const changes = pages.flatMap((p) => p.changes);
      expect(changes.map(key), `limit ${limit}`).toEqual(reference.map(key));
      expect(changes).toEqual(reference);
      for (const [i, p] of pages.entries()) {
        expect(p.changes.length, `limit ${limit} page ${i}`).toBeGreaterThan(0);
        if (i > 0) expect(seqOf(p.changes[0])).toBeGreaterThan(pages[i - 1].cursor);
        expect(seqOf(p.changes[p.changes.length - 1])).toBeLessThanOrEqual(p.cursor);
      }
      expect(pages[pages.length - 1].cursor).toBe(head);
    }
  });

  it("a page that one table fills exactly is the last page: not marked more, no empty page after it", async () => {
    const since = head;
    await pushAs(owner, Array.from({ length: 7 }, (_, i) => mutation("lot.create", { id: uuid(), species: `Late species ${i}` })));
    const newHead = Number((await db("farms").where({ id: owner.farmId }).first("seq")).seq);
    const pages = await pullAll(owner, since, 7);
    expect(pages).toHaveLength(1);
    expect(pages[0].changes.map((c) => c.table)).toEqual(Array(7).fill("lots"));
    expect(pages[0]).toMatchObject({ more: false, cursor: newHead });
    // And the same at the end of a longer walk: seven pages of seven, the last one full and final.
    await pushAs(owner, Array.from({ length: 42 }, (_, i) => mutation("lot.create", { id: uuid(), species: `Later species ${i}` })));
    const walk = await pullAll(owner, newHead, 7);
    expect(walk.map((p) => p.changes.length)).toEqual([7, 7, 7, 7, 7, 7]);
    expect(walk[walk.length - 1].more).toBe(false);
  });
});
