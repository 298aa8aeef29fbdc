import Dexie, { type EntityTable, type Table } from "dexie";
import type { Bag } from "@/lib/schemas/bag";
import type { Check } from "@/lib/schemas/check";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { Reading } from "@/lib/schemas/reading";
import type { Sowing } from "@/lib/schemas/sowing";
import type { Count } from "@/lib/schemas/count";
import type { Trial, TrialArm } from "@/lib/schemas/trial";
import type { PlanItem } from "@/lib/schemas/plan";
import type { Photo } from "@/lib/schemas/photo";
import type { MutationName } from "@/lib/schemas/mutations";
import type { Protocol } from "@/lib/schemas/protocol";
import type { SyncColumns } from "@/lib/schemas/common";

// The phone's copy of the farm: the same rows (snake_case) as the server tables, plus the outbox of
// unsent mutations, pending photo blobs, and meta (cursor, device id, identity, last sync).

export type ProtocolRow = SyncColumns & {
  species: string;
  common_name: string | null;
  phases: Protocol["phases"];
  effective_band: Protocol["effectiveBand"];
  no_cold_reason: string | null;
  toxic_seed: Protocol["toxicSeed"];
  medicinal: boolean;
  is_farm_own: boolean;
  starter_key: string | null;
  source_trial_id: string | null;
  note: string | null;
};

export type MemberRow = SyncColumns & { user_id: string; role: string; digest_opt_in: boolean; name?: string; email?: string };
export type AuditRow = { id: number; table_name: string; row_id: string; field: string; old_value: string | null; new_value: string | null; user_id: string | null; at: string; seq: number };

export type OutboxStatus = "pending" | "sending" | "rejected";
export interface OutboxEntry {
  n?: number; // local order
  id: string; // mutation id (UUID), the server's idempotency key
  name: MutationName;
  args: unknown;
  at: string;
  status: OutboxStatus;
  /** Why the server (or the phone, for another person's work) refused it; `recordedBy` names whose work it is. */
  error?: { code: string; message: string; recordedBy?: { userId: string; farmId: string } } | null;
  tries: number;
}

export interface PendingPhoto {
  id: string; // photo id (also the server row id)
  bag_id: string;
  check_id: string | null;
  blob: Blob;
  mime: string;
  created_at: string;
  tries: number;
  error?: string | null;
}

export interface MetaEntry {
  key: string;
  value: unknown;
}

export class RimebookDB extends Dexie {
  bags!: EntityTable<Bag, "id">;
  checks!: EntityTable<Check, "id">;
  lots!: EntityTable<Lot, "id">;
  stores!: EntityTable<Store, "id">;
  readings!: EntityTable<Reading, "id">;
  protocols!: EntityTable<ProtocolRow, "id">;
  sowings!: EntityTable<Sowing, "id">;
  counts!: EntityTable<Count, "id">;
  trials!: EntityTable<Trial, "id">;
  trial_arms!: EntityTable<TrialArm, "id">;
  plan_items!: EntityTable<PlanItem, "id">;
  photos!: EntityTable<Photo, "id">;
  memberships!: EntityTable<MemberRow, "id">;
  audit_log!: EntityTable<AuditRow, "id">;
  outbox!: Table<OutboxEntry, number>;
  pending_photos!: EntityTable<PendingPhoto, "id">;
  meta!: EntityTable<MetaEntry, "key">;

  constructor(name = "rimebook") {
    super(name);
    this.version(1).stores({
      bags: "id, &code, store_id, lot_id, trial_arm_id, plan_item_id, seq",
      checks: "id, bag_id, [bag_id+checked_at], checked_at, seq",
      lots: "id, species, seq",
      stores: "id, seq",
      readings: "id, store_id, [store_id+taken_at], seq",
      protocols: "id, species, starter_key, seq",
      sowings: "id, bag_id, seq",
      counts: "id, sowing_id, [sowing_id+counted_on], seq",
      trials: "id, lot_id, seq",
      trial_arms: "id, trial_id, seq",
      plan_items: "id, season, lot_id, seq",
      photos: "id, bag_id, check_id, seq",
      memberships: "id, user_id, seq",
      audit_log: "id, [table_name+row_id], seq",
      outbox: "++n, &id, status",
      pending_photos: "id, bag_id, check_id",
      meta: "key",
    });
    // v2: a bag code is unique on the server, not on the phone: two phones may pick the same code
    // offline, and the loser's row must still sync down until the grower relabels it.
    this.version(2).stores({
      bags: "id, code, store_id, lot_id, trial_arm_id, plan_item_id, seq",
      memberships: "id, user_id, role, seq",
    });
  }
}

/** The synced farm tables, in the order a pull may apply them. */
export const farmTables = [
  "protocols", "lots", "stores", "readings", "bags", "checks", "photos", "sowings", "counts",
  "trials", "trial_arms", "plan_items", "memberships",
] as const;
export type FarmTable = (typeof farmTables)[number];

let instance: RimebookDB | null = null;

/** The phone's database (one per browser profile). Tests pass their own name for isolation. */
export function getLocalDb(): RimebookDB {
  if (!instance) instance = new RimebookDB();
  return instance;
}

export function setLocalDb(db: RimebookDB | null) {
  instance = db;
}
