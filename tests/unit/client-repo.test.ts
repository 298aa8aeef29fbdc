import "fake-indexeddb/auto";
import { beforeEach, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { RimebookDB, setLocalDb } from "@/lib/client/db";
import { adoptIdentity } from "@/lib/client/identity";
import { createBag, createLot, createTrial, discardBag, recordSowing, repository, updateBag, updateLot } from "@/lib/client/repo";
import { applyPulledPage } from "@/lib/client/local-apply";
import { mutationNames, mutationTable } from "@/lib/schemas/mutations";
import { effectsOf } from "@/lib/schemas/mutation-effects";

// The phone's repository functions: one per mutation, row + outbox in one transaction, and the
// rebase of unsent edits over pulled rows.

const farmId = "farm-1";
const userId = "user-1";

async function phone(role: "owner" | "grower" | "helper" | "visitor" = "grower") {
  const db = new RimebookDB(`unit-${crypto.randomUUID()}`);
  setLocalDb(db);
  await adoptIdentity({ user: { id: userId, name: "Wren", email: "wren@example.test" }, farm: { id: farmId, name: "Bramblewick" }, role }, db);
  return db;
}

describe("repository functions", () => {
  let db: RimebookDB;
  beforeEach(async () => {
    db = await phone();
  });

  it("has exactly one function per mutation name", () => {
    expect(Object.keys(repository).sort()).toEqual([...mutationNames].sort());
  });

  it("writes the row and the outbox entry together, stamped as a local (seq 0) row", async () => {
    const lot = await createLot({ species: "Aquilegia canadensis", quantity: 200 });
    expect(await db.lots.get(lot.id)).toMatchObject({ species: "Aquilegia canadensis", quantity: 200, treated: false, seq: 0, farm_id: farmId, deleted_at: null });
    const [entry] = await db.outbox.toArray();
    expect(entry).toMatchObject({ name: "lot.create", status: "pending", tries: 0, args: { id: lot.id, species: "Aquilegia canadensis" } });
  });

  it("throws the schema's error for bad input and writes nothing", async () => {
    await expect(createLot({ species: "" })).rejects.toBeInstanceOf(ZodError);
    expect(await db.outbox.count()).toBe(0);
    expect(await db.lots.count()).toBe(0);
  });

  it("refuses on the phone what the role cannot do, and nothing is written", async () => {
    db = await phone("helper");
    await expect(createLot({ species: "Viola pedata" })).rejects.toMatchObject({ code: "forbidden" });
    expect(await db.outbox.count()).toBe(0);
  });

  it("an edit changes only the fields it names", async () => {
    const lot = await createLot({ species: "Viola pedata", source: "Hillside collection", year: 2024 });
    await updateLot(lot.id, { quantity: 90 });
    expect(await db.lots.get(lot.id)).toMatchObject({ source: "Hillside collection", year: 2024, quantity: 90 });
    expect((await db.outbox.toArray())[1].args).toEqual({ id: lot.id, patch: { quantity: 90 } });
  });

  it("a trial writes its arms; a sowing marks the bag sown only once", async () => {
    const lot = await createLot({ species: "Lupinus perennis" });
    const trial = await createTrial({ name: "Fridge or freezer", lot_id: lot.id, arms: [{ label: "Fridge 60 days" }, { label: "Freezer 60 days" }] });
    expect((await db.trial_arms.where("trial_id").equals(trial.id).sortBy("position")).map((a) => [a.label, a.position])).toEqual([["Fridge 60 days", 0], ["Freezer 60 days", 1]]);
    const bag = await createBag({ code: "M2K7QX-A", lot_id: lot.id });
    await recordSowing({ bag_id: bag.id, sown_on: "2027-03-01", seeds_sown: 50 });
    await recordSowing({ bag_id: bag.id, sown_on: "2027-03-08", seeds_sown: 20 });
    expect((await db.bags.get(bag.id))?.sown_on).toBe("2027-03-01");
    await discardBag(bag.id, "2027-03-09", "mould spreading");
    expect(await db.bags.get(bag.id)).toMatchObject({ discarded_on: "2027-03-09", discard_reason: "mould spreading" });
  });

  it("unsent edits are applied again over rows a pull replaces", async () => {
    const lot = await createLot({ species: "Asarum canadense" });
    const bag = await createBag({ code: "Z9Y8X7-Q", lot_id: lot.id, note: "old" });
    await updateBag(bag.id, { note: "mine, not yet sent" });
    const serverRow = { ...(await db.bags.get(bag.id))!, note: "theirs", box: "Box 9", seq: 41 };
    await db.transaction("rw", db.tables, () => applyPulledPage(db, [{ table: "bags", row: serverRow }], { farmId, userId, at: new Date().toISOString() }));
    expect(await db.bags.get(bag.id)).toMatchObject({ note: "mine, not yet sent", box: "Box 9", seq: 41 });
    // a tombstone removes the row; a pending edit of a removed row has nothing to edit
    await db.transaction("rw", db.tables, () =>
      applyPulledPage(db, [{ table: "bags", row: { ...serverRow, deleted_at: "2026-12-01T00:00:00.000Z" } }], { farmId, userId, at: "x" }),
    );
    expect(await db.bags.get(bag.id)).toBeUndefined();
    expect(await db.lots.get(lot.id)).toBeTruthy();
  });
});

describe("mutation effects (shared by phone and server)", () => {
  it("edits never carry defaults for fields the person did not touch", () => {
    for (const name of ["lot.update", "store.update", "bag.update", "trial.update"] as const) {
      const args = mutationTable[name].args.parse({ id: "0b5c8f8e-0b8a-4c1e-9a43-2f1f4a3c9d11", patch: {} });
      expect(args).toEqual({ id: "0b5c8f8e-0b8a-4c1e-9a43-2f1f4a3c9d11", patch: {} });
    }
    expect(mutationTable["farm.update"].args.parse({ name: "Bramblewick" })).toEqual({ name: "Bramblewick" });
  });

  it("bag codes are stored upper-case so a typed code finds its bag", () => {
    const args = mutationTable["bag.create"].args.parse({ id: "0b5c8f8e-0b8a-4c1e-9a43-2f1f4a3c9d11", code: "m2k7qx-a", lot_id: "0b5c8f8e-0b8a-4c1e-9a43-2f1f4a3c9d12" });
    expect(effectsOf("bag.create", args)[0]).toMatchObject({ op: "insert", row: { code: "M2K7QX-A" } });
  });
});
