import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { uuid } from "../support/sync";
import { POST as push } from "@/app/api/sync/push/route";
import type { MutationName } from "@/lib/schemas/mutations";

// Issue 11, item 6: a reference is checked against rows that exist on the farm when the mutation is applied,
// never against ids merely seen earlier in the same push (a refused mutation's rows were rolled back).

const ctx = { params: Promise.resolve({}) };
const at = "2026-11-20T08:00:00.000Z";
const mutation = (name: MutationName, args: unknown) => ({ id: uuid(), name, args, at });
type Rejected = { id: string; error: { code: string; message: string } };

async function pushAs(member: TestMember, mutations: { id: string }[]) {
  const res = await push(memberRequest("/api/sync/push", member, { method: "POST", json: { deviceId: "device-s", mutations } }), ctx);
  return (await res.json()) as { applied: string[]; rejected: Rejected[] };
}

describe("references inside one push", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let grower: TestMember;
  let neighbour: TestMember;
  let lotId: string;
  let theirArm: string;

  beforeAll(async () => {
    t = await freshDatabase();
    grower = await signedInMember(t.db, { role: "grower" });
    neighbour = await signedInMember(t.db, { role: "grower" });
    lotId = uuid();
    expect((await pushAs(grower, [mutation("lot.create", { id: lotId, species: "Asclepias tuberosa", year: 2025, quantity: 400 })])).rejected).toEqual([]);
    // Another farm's trial arm: naming its id in our trial makes our trial.create fail half-way (404).
    const theirLot = uuid();
    const theirTrial = uuid();
    theirArm = uuid();
    const r = await pushAs(neighbour, [
      mutation("lot.create", { id: theirLot, species: "Baptisia australis", year: 2025, quantity: 10 }),
      mutation("trial.create", { id: theirTrial, name: "Theirs", lot_id: theirLot, arms: [{ id: uuid(), label: "A" }, { id: theirArm, label: "B" }] }),
    ]);
    expect(r.rejected).toEqual([]);
  });
  afterAll(async () => t.cleanup());

  it("trial.create refused, then protocol.upsert {source_trial_id} naming that trial → refused too", async () => {
    const trialId = uuid();
    const refusedTrial = mutation("trial.create", { id: trialId, name: "Fridge or freezer", lot_id: lotId, arms: [{ id: uuid(), label: "Fridge" }, { id: theirArm, label: "Freezer" }] });
    const protocolId = uuid();
    const upsert = mutation("protocol.upsert", { id: protocolId, species: "Asclepias tuberosa", phases: [], source_trial_id: trialId });
    const r = await pushAs(grower, [refusedTrial, upsert]);
    expect(r.applied).toEqual([]);
    expect(r.rejected.map((x) => [x.id, x.error.code])).toEqual([
      [refusedTrial.id, "not_found"],
      [upsert.id, "not_found"],
    ]);
    expect(await t.db("trials").where({ id: trialId }).first()).toBeUndefined();
    expect(await t.db("protocols").where({ id: protocolId }).first()).toBeUndefined();
  });

  it("a reference to a row created earlier in the same push still works", async () => {
    const trialId = uuid();
    const protocolId = uuid();
    const r = await pushAs(grower, [
      mutation("trial.create", { id: trialId, name: "Towel or sand", lot_id: lotId, arms: [{ id: uuid(), label: "Towel" }, { id: uuid(), label: "Sand" }] }),
      mutation("protocol.upsert", { id: protocolId, species: "Asclepias tuberosa", phases: [], source_trial_id: trialId }),
    ]);
    expect(r.rejected).toEqual([]);
    expect((await t.db("protocols").where({ id: protocolId }).first()).source_trial_id).toBe(trialId);
  });
});
