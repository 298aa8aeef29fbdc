import { z } from "zod";
import { Id, IsoDay, IsoTimestamp } from "./common";
import { mutationNames, mutationRoles, type MutationName } from "./roles";
import { LotInput } from "./lot";
import { StoreInput } from "./store";
import { ReadingInput } from "./reading";
import { BagInput, BagPatch } from "./bag";
import { CheckInput } from "./check";
import { SowingInput } from "./sowing";
import { CountInput } from "./count";
import { TrialDetails, TrialInput } from "./trial";
import { PlanItemInput } from "./plan";
import { FarmSettings } from "./farm";
import { Protocol } from "./protocol";

// The single table of mutations: each name's argument schema and the least role that may run it (./roles).
// The phone's outbox, the push route and the UI (hide what a role cannot do) all read this table.

export { actionTable, canRun, mutationNames, mutationRoles, roleAtLeast, type ActionName, type MutationName } from "./roles";

type StripDefault<S> = S extends z.ZodOptional<infer I> ? StripDefault<I> : S extends z.ZodDefault<infer I> ? StripDefault<I> : S;
type EditShape<T extends z.ZodObject> = { [K in keyof T["shape"]]: z.ZodOptional<StripDefault<T["shape"][K]>> };

/**
 * Every field optional and WITHOUT its default: an edit carries only the fields the person changed,
 * so applying it field by field never resets the others to their defaults.
 */
export function editOf<T extends z.ZodObject>(schema: T): z.ZodObject<EditShape<T>> {
  const strip = (s: z.ZodType): z.ZodType => (s instanceof z.ZodOptional || s instanceof z.ZodDefault ? strip(s.unwrap() as z.ZodType) : s);
  const shape = Object.fromEntries(Object.entries(schema.shape).map(([k, s]) => [k, strip(s as z.ZodType).optional()]));
  return z.object(shape) as unknown as z.ZodObject<EditShape<T>>;
}

const patchOf = <T extends z.ZodObject>(patch: T) => z.object({ id: Id, patch: editOf(patch) });

/** Each mutation's argument schema; its least role is in ./roles (zod-free, for the screens). */
const mutationArgs = {
  "farm.update": editOf(FarmSettings),
  "member.preferences": z.object({ digest_opt_in: z.boolean() }),

  "protocol.upsert": Protocol.extend({ id: Id, starter_key: z.string().max(100).nullable().default(null), source_trial_id: Id.nullable().default(null) }),
  "protocol.delete": z.object({ id: Id }),

  "lot.create": LotInput,
  "lot.update": patchOf(LotInput.omit({ id: true })),
  "lot.delete": z.object({ id: Id }),

  "store.create": StoreInput,
  "store.update": patchOf(StoreInput.omit({ id: true })),
  "store.delete": z.object({ id: Id }),
  "reading.record": ReadingInput,

  "bag.create": BagInput,
  "bag.update": patchOf(BagPatch),
  "bag.pull": z.object({ id: Id, pulled_on: IsoDay }),
  "bag.discard": z.object({ id: Id, discarded_on: IsoDay, discard_reason: z.string().trim().max(500).nullable().default(null) }),
  "check.record": CheckInput,

  "sowing.record": SowingInput,
  "count.record": CountInput,

  "trial.create": TrialInput,
  "trial.update": patchOf(TrialDetails),
  "trial.delete": z.object({ id: Id }),

  "plan.upsert": PlanItemInput,
  "plan.delete": z.object({ id: Id }),
} as const satisfies Record<MutationName, z.ZodType>;

export const mutationTable = Object.fromEntries(mutationNames.map((n) => [n, { minRole: mutationRoles[n], args: mutationArgs[n] }])) as {
  [N in MutationName]: { minRole: (typeof mutationRoles)[N]; args: (typeof mutationArgs)[N] };
};

export type MutationArgs<N extends MutationName> = z.infer<(typeof mutationTable)[N]["args"]>;

/** One outbox entry / one element of a push. */
export const Mutation = z.object({
  id: z.string().min(8).max(64),
  name: z.enum(mutationNames as [MutationName, ...MutationName[]]),
  args: z.unknown(),
  at: IsoTimestamp,
});
export type Mutation = z.infer<typeof Mutation>;

export const PushRequest = z.object({
  deviceId: z.string().min(1).max(64),
  mutations: z.array(Mutation).max(1000, { error: "Send at most 1000 changes per request." }),
});
export type PushRequest = z.infer<typeof PushRequest>;

export const PullQuery = z.object({
  since: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(5000).default(1000),
});
