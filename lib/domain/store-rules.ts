import { DomainError } from "@/lib/errors";
import type { TemperatureBand } from "@/lib/schemas/protocol";
import { formatBagCode } from "./bag-codes";
import { defaultEffectiveBand } from "./protocols";

// When a cold store may be deleted. The phone (before it writes) and the server (before it applies a
// pushed store.delete) run the same rule, so a store never disappears from under bags still in it.

/** The fields of a bag row (as stored on the phone and the server) the rule reads. */
export interface BagPlace {
  code: string;
  pulled_on?: string | null;
  sown_on?: string | null;
  discarded_on?: string | null;
  deleted_at?: string | null;
}

/** A bag stays in its store until it is pulled, sown or discarded; a planned bag already has its place there. */
export function isBagStillInStore(bag: BagPlace): boolean {
  return !bag.deleted_at && !bag.pulled_on && !bag.sown_on && !bag.discarded_on;
}

/** The bags (of one store) that keep it from being deleted, in code order. */
export function findBagsStillInStore<B extends BagPlace>(bags: readonly B[]): B[] {
  return bags.filter(isBagStillInStore).sort((a, b) => a.code.localeCompare(b.code));
}

const listed = 8;

/** Names the first few bags by their label code: "7K3Q-9M-X, 2B8D-…, and 3 more". */
export function listBagCodes(bags: readonly BagPlace[]): string {
  const codes = bags.slice(0, listed).map((b) => formatBagCode(b.code));
  const more = bags.length - codes.length;
  return more > 0 ? `${codes.join(", ")} and ${more} more` : codes.join(", ");
}

/**
 * Refuses to delete a store that still holds bags in the cold, naming them. A store with only finished
 * bags (pulled, sown, discarded) or none may go; its readings stay for the bags' history.
 */
export function assertStoreCanBeDeleted(storeName: string, bagsOfStore: readonly BagPlace[]): void {
  const held = findBagsStillInStore(bagsOfStore);
  if (held.length === 0) return;
  const n = held.length;
  throw new DomainError(
    `${storeName} still holds ${n} bag${n === 1 ? "" : "s"} not yet pulled, sown or discarded: ${listBagCodes(held)}. ` +
      `Move ${n === 1 ? "it" : "them"} to another cold store first (edit the bag), or record ${n === 1 ? "it" : "them"} pulled, sown or discarded; then the store can be deleted.`,
    { store: `Still holds ${n} bag${n === 1 ? "" : "s"}.` },
  );
}

/**
 * The band a store's own readings are judged against, by its kind. A fridge: the product's default cold band
 * (0–10 °C, REFERENCES: stratification tables). A freezer is its own treatment, meant to sit at −18 °C (US FDA
 * food-safety guidance); a few degrees either side from door openings and defrost cycles are normal (common
 * practice), so −25 to −12 °C reads as in band. A cold frame follows the weather, so no band is applied.
 */
export function bandOfStoreKind(kind: "fridge" | "freezer" | "cold_frame"): TemperatureBand | null {
  if (kind === "freezer") return freezerBand;
  if (kind === "cold_frame") return null;
  return defaultEffectiveBand;
}

export const freezerBand: TemperatureBand = { minC: -25, maxC: -12 };

/** Whether a reading lies outside its store's band (never, for a store with no band). */
export function isOutsideStoreBand(kind: "fridge" | "freezer" | "cold_frame", temperatureC: number): boolean {
  const band = bandOfStoreKind(kind);
  return band !== null && (temperatureC < band.minC || temperatureC > band.maxC);
}
