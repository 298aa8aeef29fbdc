import { z } from "zod";
import { Id, IsoDay, IsoTimestamp } from "./common";
import { Role, roles } from "./vocabulary";
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

// The single table of mutations: each name's argument schema and the least role that may run it.
// The phone's outbox, the push route and the UI (hide what a role cannot do) all read this table.

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

export const mutationTable = {
  "farm.update": { minRole: "owner", args: editOf(FarmSettings) },
  "member.preferences": { minRole: "visitor", args: z.object({ digest_opt_in: z.boolean() }) },

  "protocol.upsert": {
    minRole: "grower",
    args: Protocol.extend({ id: Id, starter_key: z.string().max(100).nullable().default(null), source_trial_id: Id.nullable().default(null) }),
  },
  "protocol.delete": { minRole: "grower", args: z.object({ id: Id }) },

  "lot.create": { minRole: "grower", args: LotInput },
  "lot.update": { minRole: "grower", args: patchOf(LotInput.omit({ id: true })) },
  "lot.delete": { minRole: "grower", args: z.object({ id: Id }) },

  "store.create": { minRole: "grower", args: StoreInput },
  "store.update": { minRole: "grower", args: patchOf(StoreInput.omit({ id: true })) },
  "store.delete": { minRole: "grower", args: z.object({ id: Id }) },
  "reading.record": { minRole: "helper", args: ReadingInput },

  "bag.create": { minRole: "grower", args: BagInput },
  "bag.update": { minRole: "grower", args: patchOf(BagPatch) },
  "bag.pull": { minRole: "helper", args: z.object({ id: Id, pulled_on: IsoDay }) },
  "bag.discard": { minRole: "helper", args: z.object({ id: Id, discarded_on: IsoDay, discard_reason: z.string().trim().max(500).nullable().default(null) }) },
  "check.record": { minRole: "helper", args: CheckInput },

  "sowing.record": { minRole: "helper", args: SowingInput },
  "count.record": { minRole: "helper", args: CountInput },

  "trial.create": { minRole: "grower", args: TrialInput },
  "trial.update": { minRole: "grower", args: patchOf(TrialDetails) },
  "trial.delete": { minRole: "grower", args: z.object({ id: Id }) },

  "plan.upsert": { minRole: "grower", args: PlanItemInput },
  "plan.delete": { minRole: "grower", args: z.object({ id: Id }) },
} as const satisfies Record<string, { minRole: Role; args: z.ZodType }>;

export type MutationName = keyof typeof mutationTable;
export const mutationNames = Object.keys(mutationTable) as MutationName[];
export type MutationArgs<N extends MutationName> = z.infer<(typeof mutationTable)[N]["args"]>;

/** Actions that are not synced mutations but still need a role (team, exports, backups). */
export const actionTable = {
  "team.manage": "owner",
  "farm.backup": "owner",
  "farm.restore": "owner",
  "export.read": "visitor",
  "import.lots": "grower",
  "import.readings": "grower",
  "photo.upload": "helper",
} as const satisfies Record<string, Role>;
export type ActionName = keyof typeof actionTable;

const rank: Record<Role, number> = Object.fromEntries(roles.map((r, i) => [r, roles.length - i])) as Record<Role, number>;

/** Owner ⊃ Grower ⊃ Helper ⊃ Visitor. */
export function roleAtLeast(role: Role, needed: Role): boolean {
  return rank[role] >= rank[needed];
}

export function canRun(role: Role, name: MutationName | ActionName): boolean {
  const needed = name in mutationTable ? mutationTable[name as MutationName].minRole : actionTable[name as ActionName];
  return needed !== undefined && roleAtLeast(role, needed);
}

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
