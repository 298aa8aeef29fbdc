import type { Protocol, ProtocolSource } from "@/lib/schemas/protocol";
import { findToxicSeedFlag } from "./cautions";

// The starter library: only rows with a published source (REFERENCES.md "Starter protocol rows"), each showing it.
// Every new farm gets a copy (isFarmOwn false); an edited copy becomes the farm's own.

export interface StarterProtocol extends Protocol {
  key: string;
  /** Every source behind the row, for display. */
  citations: string[];
}

const kaye = "Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018";
const at5C = { minC: 5, maxC: 5 };

function source(citation: string, minDays: number, maxDays: number | null, band: ProtocolSource["band"], note = ""): ProtocolSource {
  return { citation, minDays, maxDays, band, note };
}

function define(row: Omit<StarterProtocol, "isFarmOwn" | "effectiveBand" | "toxicSeed" | "citations" | "note" | "noColdReason" | "commonName"> & Partial<StarterProtocol>): StarterProtocol {
  const citations = [...new Set(row.phases.flatMap((p) => p.sources.map((s) => s.citation)).concat(row.citations ?? []))];
  return {
    commonName: "",
    note: "",
    noColdReason: "",
    effectiveBand: null,
    isFarmOwn: false,
    toxicSeed: findToxicSeedFlag(row.species)?.flag ?? null,
    ...row,
    citations,
  };
}

export const starterProtocols: readonly StarterProtocol[] = [
  define({
    key: "asclepias-syriaca",
    species: "Asclepias syriaca",
    commonName: "common milkweed",
    medicinal: false,
    phases: [{ kind: "cold_moist", note: "", sources: [source(kaye, 14, 14, at5C, "2 weeks at 5 °C (one population tested)")] }],
  }),
  define({
    key: "asclepias-speciosa",
    species: "Asclepias speciosa",
    commonName: "showy milkweed",
    medicinal: false,
    phases: [{ kind: "cold_moist", note: "", sources: [source(kaye, 14, 28, at5C, "2–4 weeks at 5 °C")] }],
  }),
  define({
    key: "asclepias-fascicularis",
    species: "Asclepias fascicularis",
    commonName: "narrowleaf milkweed",
    medicinal: false,
    phases: [{ kind: "cold_moist", note: "", sources: [source(kaye, 28, 42, at5C, "4–6 weeks at 5 °C")] }],
  }),
  define({
    key: "echinacea-purpurea",
    species: "Echinacea purpurea",
    commonName: "purple coneflower",
    medicinal: true,
    phases: [{ kind: "cold_moist", note: "", sources: [source("HortScience 28(9):899 (1993)", 28, 28, at5C, "Best after 4 weeks at 5 °C")] }],
  }),
  define({
    key: "baptisia-australis",
    species: "Baptisia australis",
    commonName: "blue wild indigo",
    medicinal: false,
    phases: [
      { kind: "scarify", note: "Scarification is the main need.", sources: [source("Boyle & Hladun 2005, HortScience 40:1846", 0, 0, null, "Scarification is the main need")] },
      { kind: "cold_moist", note: "", sources: [source("HortScience 28:899 (1993)", 70, 70, at5C, "10 weeks at 5 °C")] },
    ],
  }),
  define({
    key: "lavandula-angustifolia",
    species: "Lavandula angustifolia",
    commonName: "lavender",
    medicinal: true,
    note: "The source gives no upper limit: check weekly and pull when roots show.",
    phases: [
      {
        kind: "cold_moist",
        note: "",
        sources: [source("Dobrowolska & Zawadzińska, Int. J. Plant & Soil Sci.", 28, null, { minC: 4, maxC: 4 }, "At 4 °C; 4 weeks was too short for most seed")],
      },
    ],
  }),
  define({
    key: "hypericum-perforatum",
    species: "Hypericum perforatum",
    commonName: "St John's wort",
    medicinal: true,
    phases: [{ kind: "cold_moist", note: "", sources: [source("Proc. Fla. State Hort. Soc.", 30, 30, { minC: 10, maxC: 10 }, "30 days at 10 °C was best")] }],
  }),
  define({
    key: "fragaria-vesca",
    species: "Fragaria vesca",
    commonName: "woodland strawberry",
    medicinal: false,
    phases: [
      { kind: "cold_moist", note: "", sources: [source("Univ. of Washington plant data sheet (after Native Plant Network)", 85, 85, null, "85 days")] },
    ],
  }),
  define({
    key: "allium-tricoccum",
    species: "Allium tricoccum",
    commonName: "ramps",
    medicinal: false,
    note: "The source says up to 2 months or more: daily checks from 60 days, pull when roots show.",
    phases: [
      { kind: "cold_moist", note: "", sources: [source("Native Plant Network protocol (USDA FS)", 60, null, null, "Up to 2 months or more")] },
    ],
  }),
  define({
    key: "sambucus",
    species: "Sambucus spp.",
    commonName: "elder",
    medicinal: true,
    phases: [
      { kind: "warm_moist", note: "", sources: [source("Young & Young 1992, Seeds of Woody Plants in North America", 90, 90, null, "90 days warm")] },
      { kind: "cold_moist", note: "", sources: [source("Young & Young 1992, Seeds of Woody Plants in North America", 90, 90, null, "then 90 days cold")] },
    ],
  }),
  define({
    key: "rudbeckia-hirta",
    species: "Rudbeckia hirta",
    commonName: "black-eyed Susan",
    medicinal: false,
    noColdReason: "No cold treatment required: sow directly.",
    citations: ["Native Plant Network protocol (USDA NRCS)"],
    phases: [],
  }),
  define({
    key: "silybum-marianum",
    species: "Silybum marianum",
    commonName: "milk thistle",
    medicinal: true,
    noColdReason: "No cold treatment required; the seed after-ripens in dry storage instead.",
    citations: ["Weed Science (milk thistle germination study)"],
    phases: [],
  }),
];

/** Fresh copies for a new farm, so edits never touch the shared library. */
export function copyStarterProtocols(): StarterProtocol[] {
  return structuredClone(starterProtocols) as StarterProtocol[];
}
