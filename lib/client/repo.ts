import type { z } from "zod";
import { AppError } from "@/lib/errors";
import { assertStoreCanBeDeleted } from "@/lib/domain/store-rules";
import { effectsOf } from "@/lib/schemas/mutation-effects";
import type { MutationArgs, mutationTable } from "@/lib/schemas/mutations";
import { canRun, type MutationName } from "@/lib/schemas/roles";
import type { BagInput, BagPatch } from "@/lib/schemas/bag";
import type { CheckInput } from "@/lib/schemas/check";
import type { CountInput } from "@/lib/schemas/count";
import type { LotInput } from "@/lib/schemas/lot";
import type { PlanItemInput } from "@/lib/schemas/plan";
import type { ProtocolInput } from "@/lib/schemas/protocol";
import type { ReadingInput } from "@/lib/schemas/reading";
import type { SowingInput } from "@/lib/schemas/sowing";
import type { StoreInput } from "@/lib/schemas/store";
import type { TrialDetails, TrialInput } from "@/lib/schemas/trial";
import type { FarmSettings } from "@/lib/schemas/farm";
import { getLocalDb, type RimebookDB } from "./db";
import { applyEffectsLocally, writeTables } from "./local-apply";
import { readIdentity } from "./meta";
import { nudgeSync } from "./sync-signal";

// The only way the UI writes: each function validates with the shared schema, writes the row(s)
// and the outbox entry in ONE Dexie transaction, and nudges the sync loop. Invalid input throws the
// ZodError (forms show its fields); a missing sign-in or a role that may not do it throws AppError.

export type InputOf<N extends MutationName> = z.input<(typeof mutationTable)[N]["args"]>;
/** Create inputs: the id is made on the phone when not given. */
type New<T extends { id?: unknown }> = Omit<T, "id"> & { id?: string };

const newId = () => crypto.randomUUID();

/**
 * The argument schemas (zod and every entity's schema) load on the first write, not with the screen, so the
 * check path's first load stays small on a weak phone. The service worker precaches the chunk like every
 * other, so a write with no signal finds it.
 */
const loadMutationTable = () => import("@/lib/schemas/mutations").then((m) => m.mutationTable);

/** Validates, writes locally with its outbox entry, nudges sync; returns the parsed args (with ids). */
export async function runMutation<N extends MutationName>(name: N, input: InputOf<N>, db: RimebookDB = getLocalDb()): Promise<MutationArgs<N>> {
  const args = (await loadMutationTable())[name].args.parse(input) as MutationArgs<N>;
  const at = new Date().toISOString();
  await db.transaction("rw", writeTables(db), async () => {
    const identity = await readIdentity(db);
    if (!identity) throw new AppError("unauthenticated", "Sign in on this phone first; nothing was saved.", undefined, 401);
    if (!canRun(identity.role, name)) throw new AppError("forbidden", "Your role on this farm does not allow that.", undefined, 403);
    await localGuards[name]?.(db, args as never);
    await applyEffectsLocally(db, effectsOf(name, args), { farmId: identity.farm.id, userId: identity.user.id, at });
    await db.outbox.add({ id: newId(), name, args, at, status: "pending", tries: 0 });
  });
  nudgeSync();
  return args;
}

/** Rules a mutation must pass on the phone before it is written (the server runs the same lib/domain rule). */
const localGuards: { [N in MutationName]?: (db: RimebookDB, args: MutationArgs<N>) => Promise<void> } = {
  "store.delete": async (db, { id }) => {
    const store = await db.stores.get(id);
    if (store) assertStoreCanBeDeleted(store.name, await db.bags.where("store_id").equals(id).toArray());
  },
};

// Farm and member
export const updateFarmSettings = (patch: Partial<FarmSettings>) => runMutation("farm.update", patch);
export const setDigestOptIn = (on: boolean) => runMutation("member.preferences", { digest_opt_in: on });

// Protocols
export const saveProtocol = (input: ProtocolInput & { id?: string; starter_key?: string | null; source_trial_id?: string | null }) =>
  runMutation("protocol.upsert", { ...input, id: input.id ?? newId() });
export const deleteProtocol = (id: string) => runMutation("protocol.delete", { id });

// Seed lots
export const createLot = (input: New<LotInput>) => runMutation("lot.create", { ...input, id: input.id ?? newId() });
export const updateLot = (id: string, patch: Partial<Omit<LotInput, "id">>) => runMutation("lot.update", { id, patch });
export const deleteLot = (id: string) => runMutation("lot.delete", { id });

// Cold stores and readings
export const createStore = (input: New<StoreInput>) => runMutation("store.create", { ...input, id: input.id ?? newId() });
export const updateStore = (id: string, patch: Partial<Omit<StoreInput, "id">>) => runMutation("store.update", { id, patch });
export const deleteStore = (id: string) => runMutation("store.delete", { id });
export const recordReading = (input: New<ReadingInput>) => runMutation("reading.record", { ...input, id: input.id ?? newId() });

// Bags and checks
export const createBag = (input: New<BagInput>) => runMutation("bag.create", { ...input, id: input.id ?? newId() });
export const updateBag = (id: string, patch: BagPatch) => runMutation("bag.update", { id, patch });
export const pullBag = (id: string, pulledOn: string) => runMutation("bag.pull", { id, pulled_on: pulledOn });
export const discardBag = (id: string, discardedOn: string, reason: string | null = null) =>
  runMutation("bag.discard", { id, discarded_on: discardedOn, discard_reason: reason });
export const recordCheck = (input: New<CheckInput>) => runMutation("check.record", { ...input, id: input.id ?? newId() });

// Sowing and germination counts
export const recordSowing = (input: New<SowingInput>) => runMutation("sowing.record", { ...input, id: input.id ?? newId() });
export const recordCount = (input: New<CountInput>) => runMutation("count.record", { ...input, id: input.id ?? newId() });

// Trials
export const createTrial = (input: Omit<New<TrialInput>, "arms"> & { arms: (Omit<TrialInput["arms"][number], "id"> & { id?: string })[] }) =>
  runMutation("trial.create", { ...input, id: input.id ?? newId(), arms: input.arms.map((a) => ({ ...a, id: a.id ?? newId() })) });
export const updateTrial = (id: string, patch: Partial<TrialDetails>) => runMutation("trial.update", { id, patch });
/** Removes the trial and its arms; its bags stay, no longer compared. */
export const deleteTrial = (id: string) => runMutation("trial.delete", { id });

// Season plan
export const savePlanItem = (input: New<PlanItemInput>) => runMutation("plan.upsert", { ...input, id: input.id ?? newId() });
export const deletePlanItem = (id: string) => runMutation("plan.delete", { id });

/** Mutation name → repository function (one each; the test checks none is missing). */
export const repository = {
  "farm.update": updateFarmSettings,
  "member.preferences": setDigestOptIn,
  "protocol.upsert": saveProtocol,
  "protocol.delete": deleteProtocol,
  "lot.create": createLot,
  "lot.update": updateLot,
  "lot.delete": deleteLot,
  "store.create": createStore,
  "store.update": updateStore,
  "store.delete": deleteStore,
  "reading.record": recordReading,
  "bag.create": createBag,
  "bag.update": updateBag,
  "bag.pull": pullBag,
  "bag.discard": discardBag,
  "check.record": recordCheck,
  "sowing.record": recordSowing,
  "count.record": recordCount,
  "trial.create": createTrial,
  "trial.update": updateTrial,
  "trial.delete": deleteTrial,
  "plan.upsert": savePlanItem,
  "plan.delete": deletePlanItem,
} satisfies Record<MutationName, (...args: never[]) => Promise<unknown>>;
