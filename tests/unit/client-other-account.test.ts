import "fake-indexeddb/auto";
import { afterEach, describe, expect, it } from "vitest";
import { RimebookDB } from "@/lib/client/db";
import { adoptIdentity } from "@/lib/client/identity";
import { SyncEngine, canRetryAs, retryRejected, setSyncEngine } from "@/lib/client/sync";

// Work recorded on a shared phone belongs to whoever recorded it, on the farm it was recorded for: when
// someone else signs in, it is held back as refused, and "Try again" sends it only for its own person and farm.

const wren = { user: { id: "u-wren", name: "Wren", email: "wren@example.test" }, farm: { id: "f-bramble", name: "Bramblewick" }, role: "helper" as const };
const tomas = { user: { id: "u-tomas", name: "Tomas", email: "tomas@example.test" }, farm: { id: "f-bramble", name: "Bramblewick" }, role: "grower" as const };
const wrenElsewhere = { ...wren, farm: { id: "f-quill", name: "Quill Seed Library" } };

async function phoneWithWaitingWork() {
  const db = new RimebookDB(`other-account-${crypto.randomUUID()}`);
  // The sync loop stays quiet: nothing here talks to a server.
  setSyncEngine(new SyncEngine({ db, baseUrl: "http://test", fetch: async () => Promise.reject(new TypeError("offline")) }));
  await adoptIdentity(wren, db);
  await db.outbox.add({ id: crypto.randomUUID(), name: "reading.record", args: { id: crypto.randomUUID() }, at: new Date().toISOString(), status: "pending", error: null, tries: 0 });
  return db;
}

afterEach(() => setSyncEngine(null));

describe("another person's waiting work on a shared phone", () => {
  it("is held back as refused, naming who recorded it and where, when someone else signs in", async () => {
    const db = await phoneWithWaitingWork();
    await adoptIdentity(tomas, db);
    const [entry] = await db.outbox.toArray();
    expect(entry.status).toBe("rejected");
    expect(entry.error).toMatchObject({ code: "other_account", recordedBy: { userId: "u-wren", farmId: "f-bramble" } });
    expect(entry.error!.message).toContain("Wren");
  });

  it.each([
    ["the person who recorded it, on the same farm", wren, true],
    ["someone else on the same farm", tomas, false],
    ["the same person on another farm", wrenElsewhere, false],
  ])("Try again is offered to %s: %s", async (_who, now, offered) => {
    const db = await phoneWithWaitingWork();
    await adoptIdentity(tomas, db); // Wren's reading is now held back
    await adoptIdentity(now, db);
    const [entry] = await db.outbox.toArray();
    expect(canRetryAs(entry, now)).toBe(offered);
    const result = await retryRejected(entry.id, db);
    expect(result.ok).toBe(offered);
    expect((await db.outbox.get(entry.n!))!.status).toBe(offered ? "pending" : "rejected");
  });

  it("refusals from the server itself (not another person's work) can be tried again by the one signed in", () => {
    expect(canRetryAs({ error: { code: "forbidden", message: "A Visitor cannot do this." } }, tomas)).toBe(true);
    expect(canRetryAs({ error: { code: "other_account", message: "older phone store, no owner recorded" } }, tomas)).toBe(false);
  });
});
