import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";
import type { Medium } from "@/lib/schemas/words";
import { generateBagCode, normalizeCrockford } from "@/lib/domain/bag-codes";
import type { IsoDay } from "@/lib/domain/dates";
import { computePullWindow } from "@/lib/domain/schedule";
import { matchProtocolBySpecies, readProtocolRow } from "@/lib/domain/rows/protocol-row";

// What the new-bag form fills in by itself from a lot, a protocol and the farm's stores. Pure, so it is tested
// without a browser; the form calls these on every change of lot, protocol, start date or store.

/** The lot's own protocol when it names one (and it still exists), else one for the same species. */
export function pickProtocolForLot(lot: Pick<Lot, "species" | "protocol_id">, protocols: readonly ProtocolRow[]): ProtocolRow | null {
  const own = lot.protocol_id ? protocols.find((p) => p.id === lot.protocol_id && !p.deleted_at) : undefined;
  return own ?? matchProtocolBySpecies(lot.species, protocols);
}

/** A fridge that holds no food first (cautions), then any fridge, then any store. */
export function pickDefaultStore(stores: readonly Store[]): Store | null {
  const live = stores.filter((s) => !s.deleted_at);
  return (
    live.find((s) => s.kind === "fridge" && !s.holds_food) ??
    live.find((s) => s.kind === "fridge") ??
    live[0] ??
    null
  );
}

export interface WindowFields {
  window_start: IsoDay | null;
  window_end: IsoDay | null;
}

/** The pull window lib/domain gives for this protocol and start day; empty when either is missing or the protocol needs no cold. */
export function fillPullWindow(protocol: ProtocolRow | null, startDay: IsoDay | null): WindowFields {
  if (!protocol || !startDay) return { window_start: null, window_end: null };
  const w = computePullWindow(readProtocolRow(protocol), startDay);
  return { window_start: w?.opensOn ?? null, window_end: w?.closesOn ?? null };
}

/**
 * A fresh bag code that is not already on this phone. `randomBytes` is crypto.getRandomValues in the app;
 * with 32^6 codes a clash is rare, so a few tries are plenty — and after them we say so rather than loop.
 */
export function generateUniqueBagCode(existing: Iterable<string>, randomBytes: () => Uint8Array, tries = 20): string {
  const taken = new Set<string>();
  for (const c of existing) taken.add(normalizeCrockford(c));
  for (let i = 0; i < tries; i++) {
    const code = generateBagCode(randomBytes());
    if (!taken.has(code)) return code;
  }
  throw new Error("Could not find an unused bag code; try again.");
}

export interface NewBagDraftInput {
  lot: Pick<Lot, "id" | "species" | "protocol_id"> | null;
  protocols: readonly ProtocolRow[];
  stores: readonly Store[];
  today: IsoDay;
  /** "now": the bag goes in today (start date defaults to today); "planned": it waits for its planned start date. */
  when: "now" | "planned";
  plannedStartOn?: IsoDay | null;
  medium?: Medium;
  storeId?: string | null;
}

export interface NewBagDraft extends WindowFields {
  lot_id: string | null;
  protocol_id: string | null;
  start_date: IsoDay | null;
  planned_start_date: IsoDay | null;
  store_id: string | null;
  box: string | null;
  medium: Medium;
}

/**
 * The form's defaults: protocol from the lot, start today (or the planned day), window from lib/domain
 * counted from whichever day the bag goes in, the cautious default store and its first box.
 */
export function buildNewBagDraft(input: NewBagDraftInput): NewBagDraft {
  const protocol = input.lot ? pickProtocolForLot(input.lot, input.protocols) : null;
  const store = input.storeId ? (input.stores.find((s) => s.id === input.storeId) ?? null) : pickDefaultStore(input.stores);
  const start = input.when === "now" ? input.today : null;
  const planned = input.when === "planned" ? (input.plannedStartOn ?? null) : null;
  return {
    lot_id: input.lot?.id ?? null,
    protocol_id: protocol?.id ?? null,
    start_date: start,
    planned_start_date: planned,
    ...fillPullWindow(protocol, start ?? planned),
    store_id: store?.id ?? null,
    box: store?.boxes[0] ?? null,
    medium: input.medium ?? "paper_towel",
  };
}
