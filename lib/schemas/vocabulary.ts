import { z } from "zod";
import { bagStates, checkActions, media, moistureLevels, mouldLevels, phaseKinds, roleOf, roles, sproutLevels, storeKinds } from "./words";

// The product's fixed words (PRODUCT.md) as schemas. The words themselves live in ./words (no zod), so a
// screen that only shows them does not load the schema library; everything here is re-exported from there.
export { bagStates, checkActions, media, moistureLevels, mouldLevels, phaseKinds, readRole, roles, sproutLevels, storeKinds, vocabularyLabels } from "./words";

export type Role = (typeof roles)[number];
/** Reads the old "viewer" as "visitor" (see roleOf in ./words). */
export const Role = z.enum([...roles, "viewer"]).transform(roleOf);

export const BagState = z.enum(bagStates);
export type BagState = z.infer<typeof BagState>;

export const Moisture = z.enum(moistureLevels);
export type Moisture = z.infer<typeof Moisture>;

export const Mould = z.enum(mouldLevels);
export type Mould = z.infer<typeof Mould>;

export const Sprouts = z.enum(sproutLevels);
export type Sprouts = z.infer<typeof Sprouts>;

export const CheckAction = z.enum(checkActions);
export type CheckAction = z.infer<typeof CheckAction>;

export const PhaseKind = z.enum(phaseKinds);
export type PhaseKind = z.infer<typeof PhaseKind>;

export const StoreKind = z.enum(storeKinds);
export type StoreKind = z.infer<typeof StoreKind>;

export const Medium = z.enum(media);
export type Medium = z.infer<typeof Medium>;
