import type { Bag } from "@/lib/schemas/bag";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";
import type { Protocol } from "@/lib/schemas/protocol";
import { starterProtocols } from "@/lib/domain/starter-protocols";

// Small row builders for the bag, lot and protocol screen tests. Names and numbers are invented demo values
// except where a starter protocol (with its published source) is used.

const stamp = { farm_id: "farm-1", created_at: "2024-01-01T00:00:00Z", updated_at: "2024-01-01T00:00:00Z", seq: 1, deleted_at: null };

let n = 0;
const nextId = () => `00000000-0000-4000-8000-${String(++n).padStart(12, "0")}`;

export function makeBag(p: Partial<Bag> & Pick<Bag, "lot_id">): Bag {
  return {
    ...stamp,
    id: nextId(),
    code: "0000000",
    protocol_id: null,
    store_id: null,
    box: null,
    medium: "paper_towel",
    seed_count: null,
    start_date: null,
    planned_start_date: null,
    window_start: null,
    window_end: null,
    pulled_on: null,
    sown_on: null,
    discarded_on: null,
    discard_reason: null,
    trial_arm_id: null,
    plan_item_id: null,
    check_every_days: null,
    note: null,
    ...p,
  };
}

export function makeLot(p: Partial<Lot> & Pick<Lot, "species">): Lot {
  return { ...stamp, id: nextId(), common_name: null, source: null, year: null, quantity: null, protocol_id: null, treated: false, notes: null, ...p };
}

export function makeStore(p: Partial<Store> & Pick<Store, "name">): Store {
  return { ...stamp, id: nextId(), kind: "fridge", boxes: [], holds_food: false, notes: null, ...p };
}

export function makeProtocolRow(p: Protocol, extra: Partial<ProtocolRow> = {}): ProtocolRow {
  return {
    ...stamp,
    id: nextId(),
    species: p.species,
    common_name: p.commonName || null,
    phases: p.phases,
    effective_band: p.effectiveBand,
    no_cold_reason: p.noColdReason || null,
    toxic_seed: p.toxicSeed,
    medicinal: p.medicinal,
    is_farm_own: p.isFarmOwn,
    starter_key: null,
    source_trial_id: null,
    note: p.note || null,
    ...extra,
  };
}

/** A stored copy of a starter row (published sources), as a new farm gets it. */
export function makeStarterRow(key: string, extra: Partial<ProtocolRow> = {}): ProtocolRow {
  const s = starterProtocols.find((x) => x.key === key);
  if (!s) throw new Error(`no starter row ${key}`);
  return makeProtocolRow(s, { starter_key: key, ...extra });
}
