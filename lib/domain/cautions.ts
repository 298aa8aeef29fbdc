import type { ToxicSeedFlag } from "@/lib/schemas/protocol";

// Cautions shown where growers can be hurt. They defer to local rules and the seed supplier.

export const seedBagCaution =
  "Keep seed bags sealed, labelled and boxed apart from food, out of reach of children. Some seeds are toxic and treated seed is poisonous. Follow local rules and your seed supplier's advice.";
export const mouldCaution = "Mouldy material: discard it sealed, do not sniff or inhale it, and wash your hands.";
export const medicinalCaution = "Growing information only, not medical advice.";

export interface ToxicGenus {
  genus: string;
  commonName: string;
  flag: ToxicSeedFlag;
}

/** Genera whose seed is toxic (REFERENCES.md "Toxic seed"). Flags recalled from memory stay unverified and show no source. */
export const toxicSeedGenera: readonly ToxicGenus[] = [
  { genus: "Sambucus", commonName: "elder", flag: { citation: "CDC, MMWR 1984 (poisoning from raw elder parts)", verified: true, note: "Raw seeds and other raw parts." } },
  { genus: "Prunus", commonName: "cherry, plum, apricot and kin", flag: { citation: "EFSA Journal 2016;14(4):4424", verified: true, note: "Kernels release cyanide." } },
  { genus: "Ricinus", commonName: "castor bean", flag: { citation: "", verified: false, note: "Source not yet recorded." } },
  { genus: "Asclepias", commonName: "milkweeds", flag: { citation: "", verified: false, note: "From memory; to be verified before a source is shown." } },
  { genus: "Lupinus", commonName: "lupins", flag: { citation: "", verified: false, note: "From memory; to be verified before a source is shown." } },
  { genus: "Baptisia", commonName: "wild indigo", flag: { citation: "", verified: false, note: "From memory; to be verified before a source is shown." } },
  { genus: "Digitalis", commonName: "foxglove", flag: { citation: "", verified: false, note: "From memory; to be verified before a source is shown." } },
  { genus: "Taxus", commonName: "yew", flag: { citation: "", verified: false, note: "From memory; to be verified before a source is shown." } },
  { genus: "Laburnum", commonName: "laburnum", flag: { citation: "", verified: false, note: "From memory; to be verified before a source is shown." } },
];

/** Looks a species name up by its genus (first word), e.g. "Sambucus nigra" or "Sambucus spp.". */
export function findToxicSeedFlag(species: string): ToxicGenus | null {
  const genus = species.trim().split(/\s+/)[0]?.toLowerCase() ?? "";
  return toxicSeedGenera.find((g) => g.genus.toLowerCase() === genus) ?? null;
}

export interface BagCautionInput {
  species: string;
  toxicSeed?: ToxicSeedFlag | null;
  medicinal?: boolean;
  /** The cold store also holds food (a kitchen fridge). */
  storeHoldsFood?: boolean;
  treatedSeed?: boolean;
}

/** The cautions to show beside a bag or protocol, most serious first. */
export function listCautions(input: BagCautionInput): string[] {
  const out: string[] = [];
  const toxic = input.toxicSeed ?? findToxicSeedFlag(input.species)?.flag ?? null;
  if (toxic || input.treatedSeed) {
    const what = input.treatedSeed ? "Treated seed is poisonous" : "This seed is toxic";
    const source = toxic?.verified && toxic.citation ? ` (${toxic.citation})` : toxic && !toxic.verified ? " (flag not yet verified)" : "";
    out.push(
      input.storeHoldsFood
        ? `${what}${source}: this store also holds food, so keep the bag sealed and boxed apart, out of reach of children.`
        : `${what}${source}: keep the bag sealed and out of reach of children.`,
    );
  }
  out.push(seedBagCaution);
  if (input.medicinal) out.push(medicinalCaution);
  return out;
}
