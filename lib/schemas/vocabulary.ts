import { z } from "zod";

// The product's fixed words (PRODUCT.md). Everything that stores or shows them imports from here.

export const roles = ["owner", "grower", "helper", "visitor"] as const;
export type Role = (typeof roles)[number];
/**
 * The read-only role was stored and sent as "viewer" until 2026-12-05 (migration
 * 20261205100000_visitor_role renamed the rows). Phones synced before that and older app versions
 * may still say it: every parse reads it as "visitor", and nothing ever answers "viewer".
 */
export const Role = z
  .enum([...roles, "viewer"])
  .transform((r): Role => (r === "viewer" ? "visitor" : r));

export const bagStates = ["planned", "chilling", "window_open", "overdue", "pulled", "sown", "discarded"] as const;
export const BagState = z.enum(bagStates);
export type BagState = z.infer<typeof BagState>;

export const moistureLevels = ["dry", "damp", "soggy"] as const; // "damp" = damp with dry corners (right)
export const Moisture = z.enum(moistureLevels);
export type Moisture = z.infer<typeof Moisture>;

export const mouldLevels = ["clean", "spots", "spreading"] as const;
export const Mould = z.enum(mouldLevels);
export type Mould = z.infer<typeof Mould>;

export const sproutLevels = ["none", "first_roots", "many"] as const;
export const Sprouts = z.enum(sproutLevels);
export type Sprouts = z.infer<typeof Sprouts>;

export const checkActions = [
  "added_water",
  "blotted",
  "fresh_towel",
  "removed_mouldy_seed",
  "pulled",
  "discarded",
] as const;
export const CheckAction = z.enum(checkActions);
export type CheckAction = z.infer<typeof CheckAction>;

export const phaseKinds = ["warm_moist", "cold_moist", "frozen", "scarify", "light"] as const;
export const PhaseKind = z.enum(phaseKinds);
export type PhaseKind = z.infer<typeof PhaseKind>;

export const storeKinds = ["fridge", "freezer", "cold_frame"] as const;
export const StoreKind = z.enum(storeKinds);
export type StoreKind = z.infer<typeof StoreKind>;

export const media = ["paper_towel", "sand", "vermiculite", "peat", "coir", "other"] as const;
export const Medium = z.enum(media);
export type Medium = z.infer<typeof Medium>;

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
