import "fake-indexeddb/auto";
import { beforeEach, describe, expect, it } from "vitest";
import { RimebookDB, setLocalDb } from "@/lib/client/db";
import { adoptIdentity, signOut } from "@/lib/client/identity";
import { countLeftBehind } from "@/lib/client/farm-switch";
import { queuePhoto } from "@/lib/client/photos";
import { createBag, createLot, createStore, recordCheck, recordReading, updateBag } from "@/lib/client/repo";
import { outboxCounts } from "@/lib/client/sync";
import { tallyWaiting } from "@/lib/client/waiting";
import { allGoodDraft } from "@/components/check/check-draft";
import { planCheckSave } from "@/components/check/check-save";
import { describeSyncStatus, unsentWords, waitingCount, waitingWords } from "@/components/shell/sync-words";

// What waits on the phone is counted as the person recorded it: the pill, the sync details, sign-out
// and farm switching say the same number for the same work, however many outbox entries a save wrote.

async function phone() {
  const db = new RimebookDB(`waiting-${crypto.randomUUID()}`);
  setLocalDb(db);
  await adoptIdentity({ user: { id: "user-1", name: "Wren", email: "wren@example.test" }, farm: { id: "farm-1", name: "Bramblewick" }, role: "grower" }, db);
  return db;
}

/** Saves a check exactly as the check sheet does (check, then the store reading its temperature makes, then the photo). */
async function saveCheck(bag: { id: string; storeId: string }, temperatureText = "", photo = false) {
  const r = planCheckSave({ ...allGoodDraft, temperatureText }, { bag, now: new Date(), today: "2026-12-04", unit: "C", newId: () => crypto.randomUUID() });
  if (!r.ok) throw new Error(JSON.stringify(r.fields));
  await recordCheck(r.plan.check);
  if (r.plan.reading) await recordReading(r.plan.reading);
  if (photo) await queuePhoto({ bagId: bag.id, checkId: r.plan.check.id, blob: new Blob([new Uint8Array([0xff, 0xd8, 0xff])], { type: "image/jpeg" }) });
  return r.plan;
}

describe("counting what waits on the phone", () => {
  let db: RimebookDB;
  let bag: { id: string; storeId: string };
  beforeEach(async () => {
    db = await phone();
    const store = await createStore({ name: "Walk-in fridge", kind: "fridge" });
    const lot = await createLot({ species: "Asclepias tuberosa" });
    const b = await createBag({ code: "BW0001", lot_id: lot.id, store_id: store.id, start_date: "2026-11-01" });
    bag = { id: b.id, storeId: store.id };
    await db.outbox.clear(); // the set-up is already on the farm
  });

  it("two checks, one with a temperature and a photo, are 2 checks and 1 photo (not 3 changes and 1 photo)", async () => {
    const first = await saveCheck(bag, "3.5", true);
    await saveCheck(bag);
    expect(first.reading).not.toBeNull(); // the temperature did write a store reading too
    expect(await db.outbox.count()).toBe(3);

    const counts = await outboxCounts(db);
    expect(counts).toMatchObject({ pending: 2, photos: 1, rejected: 0 });
    expect(waitingWords(counts.waiting)).toBe("2 checks and 1 photo");
    expect(waitingCount(counts.waiting)).toBe("3 waiting");
    // The pill says the same number the details start with.
    expect(describeSyncStatus({ phase: "offline", online: false, lastSyncAt: null, ...counts }).text).toBe("Offline · 3 waiting");
  });

  it("sign-out and farm switching warn with the same words", async () => {
    await saveCheck(bag, "3.5", true);
    await saveCheck(bag);
    const out = await signOut({ db, fetch: () => Promise.reject(new TypeError("offline")) });
    expect(out.ok).toBe(false);
    if (!out.ok) expect(unsentWords(out.waiting)).toBe("2 checks and 1 photo are");
    const left = await countLeftBehind(db);
    expect(left).toMatchObject({ pending: 2, photos: 1, refused: 0 });
    expect(unsentWords(left.waiting)).toBe("2 checks and 1 photo are");
  });

  it("a reading typed on its own counts; edits of one bag are one change; kinds keep the order they were recorded in", async () => {
    await updateBag(bag.id, { note: "Back shelf" });
    await updateBag(bag.id, { box: "Box 2" });
    await recordReading({ store_id: bag.storeId, taken_at: new Date().toISOString(), temperature_c: 2.5 });
    await saveCheck(bag, "4");
    const { waiting } = await outboxCounts(db);
    expect(waiting).toEqual({
      records: 3,
      photos: 0,
      parts: [
        { name: "bag.update", n: 1 },
        { name: "reading.record", n: 1 },
        { name: "check.record", n: 1 },
      ],
    });
    expect(waitingWords(waiting)).toBe("1 bag edit, 1 temperature reading and 1 check");
  });

  it("a refused photo or change is not waiting: it counts as not saved", async () => {
    const plan = await saveCheck(bag, "", true);
    const [photo] = await db.pending_photos.toArray();
    await db.pending_photos.update(photo.id, { error: "Upload refused (415)." });
    const entry = await db.outbox.where("id").notEqual("").first();
    await db.outbox.update(entry!.n!, { status: "rejected", error: { code: "forbidden", message: "No." } });
    expect(plan.check.id).toBeTruthy();
    expect(await outboxCounts(db)).toMatchObject({ pending: 0, photos: 0, rejected: 2 });
    expect(describeSyncStatus({ phase: "idle", online: true, lastSyncAt: null, ...(await outboxCounts(db)) }).text).toBe("Sync error · 2 not saved");
  });

  it("a reading whose check was already sent still counts", () => {
    const tally = tallyWaiting([{ name: "reading.record", args: { id: "r1", check_id: "c-sent" } }], 0);
    expect(tally).toEqual({ records: 1, photos: 0, parts: [{ name: "reading.record", n: 1 }] });
  });
});
