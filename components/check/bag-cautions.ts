import { findToxicSeedFlag } from "@/lib/domain/cautions";
import type { ToxicSeedFlag } from "@/lib/schemas/protocol";
import { cautionTexts } from "@/components/ui/Caution";

// Which calm cautions a bag carries (check sheet header, labels). Detection only; the words live in cautionTexts.

export type BagCautionKey = "treated" | "toxic" | "foodFridge" | "medicinal";

export interface BagCaution {
  key: BagCautionKey;
  title: string;
  text: string;
  /** Where the toxic flag comes from, when a verified source is known. */
  source?: string;
}

export interface BagCautionFacts {
  species: string;
  toxicSeed?: ToxicSeedFlag | null;
  medicinal?: boolean;
  treated?: boolean;
  storeHoldsFood?: boolean;
}

export function pickBagCautions(f: BagCautionFacts): BagCaution[] {
  const out: BagCaution[] = [];
  if (f.treated) out.push({ key: "treated", title: "Treated seed", text: cautionTexts.treated });
  const toxic = f.toxicSeed ?? findToxicSeedFlag(f.species)?.flag ?? null;
  if (toxic) {
    out.push({
      key: "toxic",
      title: "Toxic seed",
      text: cautionTexts.toxic,
      source: toxic.verified && toxic.citation ? toxic.citation : undefined,
    });
  }
  // Only where food is kept: the toxic and treated cautions already say to keep such seed away from food.
  if (f.storeHoldsFood) out.push({ key: "foodFridge", title: "This fridge and food", text: cautionTexts.foodFridge });
  if (f.medicinal) out.push({ key: "medicinal", title: "Medicinal plant", text: cautionTexts.medicinal });
  return out;
}
