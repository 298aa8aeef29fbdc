import type { ProtocolInput, ProtocolPhase, ProtocolSource, TemperatureBand, ToxicSeedFlag } from "@/lib/schemas/protocol";
import type { PhaseKind } from "@/lib/schemas/words";
import type { ProtocolRow } from "@/lib/client/db";
import { isTimedPhase } from "@/lib/domain/protocols";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";

// The protocol form edits numbers as fields that may be blank; the shared Protocol schema wants numbers or null.
// These two functions translate between them, and copying a starter row makes the farm's own editable copy.

export interface BandFields {
  minC: number | null;
  maxC: number | null;
}

export interface SourceFields {
  citation: string;
  minDays: number | null;
  /** Blank: the source gives no upper limit. */
  maxDays: number | null;
  band: BandFields;
  note: string;
}

export interface PhaseFields {
  kind: PhaseKind;
  note: string;
  sources: SourceFields[];
}

export interface ProtocolFormValues {
  species: string;
  commonName: string;
  phases: PhaseFields[];
  effectiveBand: BandFields;
  noColdReason: string;
  medicinal: boolean;
  toxicSeed: ToxicSeedFlag | null;
  note: string;
}

const toBandFields = (b: TemperatureBand | null | undefined): BandFields => ({ minC: b?.minC ?? null, maxC: b?.maxC ?? null });

/** Both blank: no band (null). One blank: the other end stands for both, e.g. "at 5 °C". */
export function readBandFields(b: BandFields): TemperatureBand | null {
  const min = Number.isFinite(b.minC) ? b.minC : null;
  const max = Number.isFinite(b.maxC) ? b.maxC : null;
  if (min === null && max === null) return null;
  return { minC: (min ?? max) as number, maxC: (max ?? min) as number };
}

export const blankSource = (): SourceFields => ({ citation: "", minDays: null, maxDays: null, band: { minC: null, maxC: null }, note: "" });
export const blankPhase = (kind: PhaseKind = "cold_moist"): PhaseFields => ({ kind, note: "", sources: [blankSource()] });

export function toFormValues(p: Omit<ProtocolInput, "isFarmOwn"> & Partial<Pick<ProtocolInput, "isFarmOwn">>): ProtocolFormValues {
  return {
    species: p.species,
    commonName: p.commonName ?? "",
    phases: p.phases.map((ph) => ({
      kind: ph.kind,
      note: ph.note ?? "",
      sources: (ph.sources ?? []).map((s) => ({
        citation: s.citation,
        minDays: s.minDays,
        maxDays: s.maxDays,
        band: toBandFields(s.band),
        note: s.note ?? "",
      })),
    })),
    effectiveBand: toBandFields(p.effectiveBand),
    noColdReason: p.noColdReason ?? "",
    medicinal: p.medicinal ?? false,
    toxicSeed: p.toxicSeed ? { ...p.toxicSeed, note: p.toxicSeed.note ?? "" } : null,
    note: p.note ?? "",
  };
}

/** What the form hands to the Protocol schema. Written on this farm, so always the farm's own. */
export function fromFormValues(v: ProtocolFormValues): ProtocolInput {
  return {
    species: v.species,
    commonName: v.commonName,
    phases: v.phases.map(
      (ph): ProtocolPhase => ({
        kind: ph.kind,
        note: ph.note,
        sources: ph.sources.map(
          (s): ProtocolSource => ({
            citation: s.citation,
            // Timed phases: left as typed (null when blank) so the schema says "Enter a number of days." in the field.
            // Steps without days (scarify, light) hide the day fields, so blanks there mean zero.
            minDays: (isTimedPhase(ph.kind) ? s.minDays : (s.minDays ?? 0)) as number,
            maxDays: Number.isFinite(s.maxDays) ? s.maxDays : isTimedPhase(ph.kind) ? null : 0,
            band: readBandFields(s.band),
            note: s.note,
          }),
        ),
      }),
    ),
    effectiveBand: readBandFields(v.effectiveBand),
    isFarmOwn: true,
    noColdReason: v.noColdReason,
    toxicSeed: v.toxicSeed,
    medicinal: v.medicinal,
    note: v.note,
  };
}

/** The farm's own copy of a row: same phases and sources (citations kept), a new id, no longer a starter row. */
export function copyToFarmOwn(row: ProtocolRow, newId: string): ProtocolInput & { id: string; starter_key: null } {
  const p = readProtocolRow(row);
  const from = row.is_farm_own ? "the farm's protocol" : "the published starter row";
  const copied = `Copied from ${from}; its sources are kept.`;
  return { ...p, id: newId, isFarmOwn: true, starter_key: null, note: p.note ? `${p.note}\n${copied}` : copied };
}
