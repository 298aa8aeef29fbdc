import type { MutationArgs, MutationName } from "./mutations";

// What a mutation does to the farm's rows, as plain data. The phone (optimistic write into Dexie)
// and the server (apply inside a knex transaction) both run `effectsOf` on the same validated
// args, so the row a check or a bag becomes cannot drift between the two. Server-stamped columns
// (farm_id, created_at, updated_at, seq, deleted_at; checked_by/uploaded_by) are added by each side.

/** Tables a mutation may write (the synced farm tables). */
export type EffectTable =
  | "protocols" | "lots" | "stores" | "readings" | "bags" | "checks" | "photos" | "sowings" | "counts"
  | "trials" | "trial_arms" | "plan_items" | "memberships";

export type RowValues = Record<string, unknown> & { id: string };

export type Effect =
  /** A new row. `appendOnly`: a row that already exists is left as it is (checks, readings, counts). */
  | { op: "insert"; table: EffectTable; row: RowValues; appendOnly?: boolean }
  /** Insert, or edit field by field when the row exists (protocols, plan items). */
  | { op: "upsert"; table: EffectTable; row: RowValues }
  /** Edit some fields of an existing row; later arrival wins per field. `fillOnly`: set only fields that are still empty. */
  | { op: "patch"; table: EffectTable; id: string; fields: Record<string, unknown>; fillOnly?: boolean }
  /** Soft delete; `with`: rows pointing at it by `column` go with it (a trial's arms), never rows merely linked (bags). */
  | { op: "tombstone"; table: EffectTable; id: string; with?: { table: EffectTable; column: string } }
  /** The farm's own settings (the farms row). */
  | { op: "farm"; fields: Record<string, unknown> }
  /** The signed-in member's own membership row. */
  | { op: "own_membership"; fields: Record<string, unknown> };

/** Columns that point at another farm-owned row: the server refuses ids outside the member's farm. */
export const rowReferences: Partial<Record<EffectTable, Record<string, EffectTable>>> = {
  protocols: { source_trial_id: "trials" },
  lots: { protocol_id: "protocols" },
  readings: { store_id: "stores", check_id: "checks" },
  bags: { lot_id: "lots", protocol_id: "protocols", store_id: "stores", trial_arm_id: "trial_arms", plan_item_id: "plan_items" },
  checks: { bag_id: "bags" },
  photos: { bag_id: "bags", check_id: "checks" },
  sowings: { bag_id: "bags" },
  counts: { sowing_id: "sowings" },
  trials: { lot_id: "lots" },
  trial_arms: { trial_id: "trials" },
  plan_items: { lot_id: "lots", protocol_id: "protocols", bag_id: "bags" },
};

/** Columns kept as JSON text on the server and as values on the phone. */
export const jsonColumns: Partial<Record<EffectTable, readonly string[]>> = {
  protocols: ["phases", "effective_band", "toxic_seed"],
  stores: ["boxes"],
  checks: ["actions"],
  plan_items: ["sowing_rule"],
};

/** Columns SQLite hands back as 0/1. */
export const booleanColumns: Partial<Record<EffectTable, readonly string[]>> = {
  protocols: ["medicinal", "is_farm_own"],
  lots: ["treated"],
  stores: ["holds_food"],
  memberships: ["digest_opt_in"],
};

/** Records that are only ever added: they never conflict. */
export const appendOnlyTables: readonly EffectTable[] = ["checks", "readings", "counts"];

/** The protocol row (snake_case, as stored) for a protocol.upsert. */
export function protocolRow(a: MutationArgs<"protocol.upsert">): RowValues {
  return {
    id: a.id,
    species: a.species,
    common_name: a.commonName || null,
    phases: a.phases,
    effective_band: a.effectiveBand ?? null,
    no_cold_reason: a.noColdReason || null,
    toxic_seed: a.toxicSeed ?? null,
    medicinal: a.medicinal,
    is_farm_own: a.isFarmOwn,
    starter_key: a.starter_key ?? null,
    source_trial_id: a.source_trial_id ?? null,
    note: a.note || null,
  };
}

const patch = (table: EffectTable, a: { id: string; patch: Record<string, unknown> }): Effect => ({
  op: "patch",
  table,
  id: a.id,
  fields: definedOnly(a.patch),
});

function definedOnly(o: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined));
}

type EffectBuilders = { [N in MutationName]: (args: MutationArgs<N>) => Effect[] };

const builders: EffectBuilders = {
  "farm.update": (a) => [{ op: "farm", fields: definedOnly(a) }],
  "member.preferences": (a) => [{ op: "own_membership", fields: { digest_opt_in: a.digest_opt_in } }],

  "protocol.upsert": (a) => [{ op: "upsert", table: "protocols", row: protocolRow(a) }],
  "protocol.delete": (a) => [{ op: "tombstone", table: "protocols", id: a.id }],

  "lot.create": (a) => [{ op: "insert", table: "lots", row: { ...a } }],
  "lot.update": (a) => [patch("lots", a)],
  "lot.delete": (a) => [{ op: "tombstone", table: "lots", id: a.id }],

  "store.create": (a) => [{ op: "insert", table: "stores", row: { ...a } }],
  "store.update": (a) => [patch("stores", a)],
  "store.delete": (a) => [{ op: "tombstone", table: "stores", id: a.id }],
  "reading.record": (a) => [{ op: "insert", table: "readings", row: { ...a }, appendOnly: true }],

  "bag.create": (a) => [{ op: "insert", table: "bags", row: { ...a, code: a.code.toUpperCase() } }],
  "bag.update": (a) => [patch("bags", a)],
  "bag.pull": (a) => [{ op: "patch", table: "bags", id: a.id, fields: { pulled_on: a.pulled_on } }],
  "bag.discard": (a) => [
    { op: "patch", table: "bags", id: a.id, fields: { discarded_on: a.discarded_on, discard_reason: a.discard_reason } },
  ],
  "check.record": (a) => [{ op: "insert", table: "checks", row: { ...a }, appendOnly: true }],

  // Sowing a bag also marks the bag sown (first sowing date kept when a bag is sown in several trays).
  "sowing.record": (a) => [
    { op: "insert", table: "sowings", row: { ...a }, appendOnly: true },
    { op: "patch", table: "bags", id: a.bag_id, fields: { sown_on: a.sown_on }, fillOnly: true },
  ],
  "count.record": (a) => [{ op: "insert", table: "counts", row: { ...a }, appendOnly: true }],

  "trial.create": ({ arms, ...trial }) => [
    { op: "insert", table: "trials", row: { ...trial } },
    ...arms.map((arm, i): Effect => ({
      op: "insert",
      table: "trial_arms",
      row: { ...arm, position: arm.position || i, trial_id: trial.id },
    })),
  ],
  "trial.update": (a) => [patch("trials", a)],
  // The arms go with the trial; bags keep their arm id for history and simply stop being compared.
  "trial.delete": (a) => [{ op: "tombstone", table: "trials", id: a.id, with: { table: "trial_arms", column: "trial_id" } }],

  "plan.upsert": (a) => [{ op: "upsert", table: "plan_items", row: { ...a } }],
  "plan.delete": (a) => [{ op: "tombstone", table: "plan_items", id: a.id }],
};

/** The row writes a mutation makes. `args` must already be parsed by the mutation's schema. */
export function effectsOf<N extends MutationName>(name: N, args: MutationArgs<N>): Effect[] {
  return (builders[name] as (a: MutationArgs<N>) => Effect[])(args);
}

/** Values compare equal when their stored (JSON) forms match; used to skip no-op edits and audit entries. */
export function sameValue(a: unknown, b: unknown): boolean {
  return JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
}
