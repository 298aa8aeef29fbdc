import type { ProtocolRow } from "@/lib/client/db";
import type { Protocol, ProtocolInput, ProtocolPhase } from "@/lib/schemas/protocol";

// The phone stores protocols as snake_case rows; lib/domain and the Protocol schema use camelCase.

/** The Protocol shape of a stored row (for reconcileProtocol, computePullWindow and the edit form). */
export function readProtocolRow(row: ProtocolRow): Protocol {
  return {
    species: row.species,
    commonName: row.common_name ?? "",
    phases: Array.isArray(row.phases) ? row.phases : [],
    effectiveBand: row.effective_band ?? null,
    isFarmOwn: Boolean(row.is_farm_own),
    noColdReason: row.no_cold_reason ?? "",
    toxicSeed: row.toxic_seed ?? null,
    medicinal: Boolean(row.medicinal),
    note: row.note ?? "",
  };
}

/** A farm-own protocol on a base row's species, band and cautions, with new phases (a trial's winner, the farm's record). */
export function toFarmOwnProtocol(
  base: Pick<ProtocolRow, "species" | "common_name" | "effective_band" | "toxic_seed" | "medicinal"> | null,
  species: string,
  phases: ProtocolPhase[],
  note: string,
): ProtocolInput {
  return {
    species: base?.species ?? species,
    commonName: base?.common_name ?? "",
    phases,
    effectiveBand: base?.effective_band ?? null,
    isFarmOwn: true,
    noColdReason: "",
    toxicSeed: base?.toxic_seed ?? null,
    medicinal: base?.medicinal ?? false,
    note: note.slice(0, 1000),
  };
}

function genusOf(species: string): string {
  return species.trim().split(/\s+/)[0]?.toLowerCase() ?? "";
}

function isGenusOnly(species: string): boolean {
  const words = species.trim().split(/\s+/);
  return words.length === 1 || /^spp?\.?$/i.test(words[1] ?? "");
}

/**
 * The protocol a lot of this species would use: the same species (the farm's own first), else a genus-wide row
 * ("Sambucus spp.") when either name names only the genus.
 */
export function matchProtocolBySpecies<T extends Pick<ProtocolRow, "species" | "is_farm_own" | "deleted_at">>(
  species: string,
  protocols: readonly T[],
): T | null {
  const live = protocols.filter((p) => !p.deleted_at);
  const wanted = species.trim().toLowerCase();
  const byOwnFirst = (a: T, b: T) => Number(Boolean(b.is_farm_own)) - Number(Boolean(a.is_farm_own));
  const exact = live.filter((p) => p.species.trim().toLowerCase() === wanted).sort(byOwnFirst);
  if (exact.length) return exact[0];
  const genus = genusOf(species);
  const byGenus = live
    .filter((p) => genusOf(p.species) === genus && (isGenusOnly(p.species) || isGenusOnly(species)))
    .sort(byOwnFirst);
  return byGenus[0] ?? null;
}
