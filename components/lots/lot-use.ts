import type { Bag } from "@/lib/schemas/bag";
import type { Lot } from "@/lib/schemas/lot";

// How much of each seed lot is already committed to bags, against the quantity on hand.

export interface LotUse {
  bags: number;
  /** Seeds counted into bags (bags without a count add nothing, and are counted in `bagsWithoutCount`). */
  seedsInBags: number;
  bagsWithoutCount: number;
  /** Quantity minus seeds in bags; null when the lot's quantity is unknown. */
  left: number | null;
  /** More seed in bags than the lot holds: the quantity is probably out of date. */
  overCommitted: boolean;
}

/** Every live bag counts, discarded ones too: their seed was used up all the same. */
export function summarizeLotUse(lot: Pick<Lot, "id" | "quantity">, bags: readonly Pick<Bag, "lot_id" | "seed_count" | "deleted_at">[]): LotUse {
  let count = 0;
  let seeds = 0;
  let without = 0;
  for (const b of bags) {
    if (b.lot_id !== lot.id || b.deleted_at) continue;
    count++;
    if (b.seed_count === null || b.seed_count === undefined) without++;
    else seeds += b.seed_count;
  }
  const left = lot.quantity === null || lot.quantity === undefined ? null : lot.quantity - seeds;
  return { bags: count, seedsInBags: seeds, bagsWithoutCount: without, left, overCommitted: left !== null && left < 0 };
}

/** "120 of 420 seeds in 3 bags" and the like. */
export function describeLotUse(lot: Pick<Lot, "quantity">, use: LotUse): string {
  const bagWord = `${use.bags} bag${use.bags === 1 ? "" : "s"}`;
  if (use.bags === 0) return lot.quantity === null ? "No bags yet" : `${lot.quantity} seeds, none in bags yet`;
  const inBags = lot.quantity === null ? `${use.seedsInBags} seeds in ${bagWord}` : `${use.seedsInBags} of ${lot.quantity} seeds in ${bagWord}`;
  const unknown = use.bagsWithoutCount ? ` (${use.bagsWithoutCount} without a count)` : "";
  return inBags + unknown;
}

const collator = new Intl.Collator("en", { numeric: true, sensitivity: "base" });

/** Species A→Z, then newest year first, then source. */
export function sortLots<T extends Pick<Lot, "species" | "year" | "source">>(lots: readonly T[]): T[] {
  return [...lots].sort(
    (a, b) => collator.compare(a.species, b.species) || (b.year ?? 0) - (a.year ?? 0) || collator.compare(a.source ?? "", b.source ?? ""),
  );
}
