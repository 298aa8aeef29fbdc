// The product's fixed words (PRODUCT.md), without zod: screens on the check path import them from here so
// the schema library stays out of their first load. lib/schemas/vocabulary.ts builds the schemas on them.

export const roles = ["owner", "grower", "helper", "visitor"] as const;
export type Role = (typeof roles)[number];
export const bagStates = ["planned", "chilling", "window_open", "overdue", "pulled", "sown", "discarded"] as const;
export type BagState = (typeof bagStates)[number];

export const moistureLevels = ["dry", "damp", "soggy"] as const; // "damp" = damp with dry corners (right)
export type Moisture = (typeof moistureLevels)[number];

export const mouldLevels = ["clean", "spots", "spreading"] as const;
export type Mould = (typeof mouldLevels)[number];

export const sproutLevels = ["none", "first_roots", "many"] as const;
export type Sprouts = (typeof sproutLevels)[number];

export const checkActions = [
  "added_water",
  "blotted",
  "fresh_towel",
  "removed_mouldy_seed",
  "pulled",
  "discarded",
] as const;
export type CheckAction = (typeof checkActions)[number];

export const phaseKinds = ["warm_moist", "cold_moist", "frozen", "scarify", "light"] as const;
export type PhaseKind = (typeof phaseKinds)[number];
/** Phases that take days in a bag; scarify and light are steps or needs without a duration. */
export const timedPhaseKinds = ["warm_moist", "cold_moist", "frozen"] as const satisfies readonly PhaseKind[];

export const storeKinds = ["fridge", "freezer", "cold_frame"] as const;
export type StoreKind = (typeof storeKinds)[number];

export const media = ["paper_towel", "sand", "vermiculite", "peat", "coir", "other"] as const;
export type Medium = (typeof media)[number];

/** Labels a grower reads; keys stay stable in storage. */
export const vocabularyLabels = {
  role: { owner: "Owner", grower: "Grower", helper: "Helper", visitor: "Visitor" },
  bagState: {
    planned: "Planned",
    chilling: "Chilling",
    window_open: "Window open",
    overdue: "Overdue",
    pulled: "Pulled",
    sown: "Sown",
    discarded: "Discarded",
  },
  moisture: { dry: "Dry", damp: "Damp, dry corners", soggy: "Soggy" },
  mould: { clean: "Clean", spots: "Spots", spreading: "Spreading" },
  sprouts: { none: "None", first_roots: "First roots", many: "Many" },
  checkAction: {
    added_water: "Added a few drops",
    blotted: "Blotted dry",
    fresh_towel: "Fresh towel",
    removed_mouldy_seed: "Removed mouldy seed",
    pulled: "Pulled",
    discarded: "Discarded",
  },
  phaseKind: {
    warm_moist: "Warm-moist",
    cold_moist: "Cold-moist",
    frozen: "Frozen",
    scarify: "Scarify",
    light: "Light",
  },
  storeKind: { fridge: "Fridge", freezer: "Freezer", cold_frame: "Cold frame" },
  medium: {
    paper_towel: "Paper towel",
    sand: "Sand",
    vermiculite: "Vermiculite",
    peat: "Peat",
    coir: "Coir",
    other: "Other",
  },
} as const;

/**
 * The read-only role was stored and sent as "viewer" until 2026-12-05 (migration
 * 20261205100000_visitor_role renamed the rows). Phones synced before that and older app versions
 * may still say it: every read takes it as "visitor", and nothing ever answers "viewer".
 */
export function roleOf(value: "viewer" | Role): Role {
  return value === "viewer" ? "visitor" : value;
}

/** A stored role as the phone reads it: an unknown word reads as the least role, "visitor". */
export function readRole(value: unknown): Role {
  if (value === "viewer") return "visitor";
  return (roles as readonly unknown[]).includes(value) ? (value as Role) : "visitor";
}

/** The one-tap "all good": damp with dry corners, clean, no sprouts. */
export const allGoodFindings = { moisture: "damp", mould: "clean", sprouts: "none" } as const;
