import { describeFarmRecordSource, type PublishedDays } from "@/lib/domain/farm-history";
import { reconcileProtocol } from "@/lib/domain/protocols";
import type { RootsHistory } from "@/lib/domain/rows/farm-history-rows";
import type { ProtocolPhase } from "@/lib/schemas/protocol";
import { toFarmOwnProtocol } from "@/lib/domain/rows/protocol-row";
import { mutationTable, type MutationArgs } from "@/lib/schemas/mutations";
import type { ProtocolRow } from "@/lib/client/db";

// The farm's own protocol from its bag history, saved through protocol.upsert like a trial's winner. The published
// sources stay beside the farm's record, so the protocol page shows both and plans for the earlier (common practice).

export const farmRecordPrefix = "This farm's record";

/** The farm-own protocol an earlier acceptance saved for this species, to update rather than duplicate. */
export function findFarmRecordProtocol(species: string, protocols: readonly ProtocolRow[]): ProtocolRow | null {
  const key = species.trim().toLowerCase();
  return (
    protocols.find(
      (p) => !p.deleted_at && p.is_farm_own && p.species.trim().toLowerCase() === key && p.phases.some((ph) => ph.sources.some((s) => s.citation.startsWith(farmRecordPrefix))),
    ) ?? null
  );
}

export function buildFarmRecordProtocol(input: {
  id: string;
  species: string;
  base: Pick<ProtocolRow, "species" | "common_name" | "phases" | "effective_band" | "toxic_seed" | "medicinal"> | null;
  history: RootsHistory;
}): MutationArgs<"protocol.upsert"> {
  const { window, seasons } = input.history;
  if (window.dailyFromDay === null) throw new Error("Not enough of the farm's own bags showed roots to suggest a window.");
  // Keep the published sources of the last timed phase; drop an earlier farm record (it is replaced).
  const basePhases: ProtocolPhase[] = (input.base?.phases ?? []).map((p) => ({ ...p, sources: p.sources.filter((s) => !s.citation.startsWith(farmRecordPrefix)) }));
  const reconciled = reconcileProtocol({ species: input.species, phases: basePhases, effectiveBand: input.base?.effective_band ?? null });
  const timedIdx = reconciled.phases.map((p, i) => (p.timed ? i : -1)).filter((i) => i >= 0);
  const lastIdx = timedIdx.length ? timedIdx[timedIdx.length - 1] : -1;
  // Days the earlier timed phases take (the farm counts days from the bag's start, as the published window does).
  const earlierDays = timedIdx.slice(0, -1).reduce((s, i) => s + reconciled.phases[i].minDays, 0);
  const published: PublishedDays | null = window.published;
  const minDays = Math.max(0, window.dailyFromDay - earlierDays);
  const farmLatest = window.latest === null ? null : window.latest - earlierDays;
  const publishedMax = published?.maxDays === null || published === null ? null : published.maxDays - earlierDays;
  const maxDays = published && published.maxDays === null ? null : Math.max(minDays, farmLatest ?? 0, publishedMax ?? 0);
  const lastBase = lastIdx >= 0 ? basePhases[lastIdx] : null;
  const farmSource = {
    citation: describeFarmRecordSource(window, seasons),
    minDays,
    maxDays,
    band: lastBase?.sources[0]?.band ?? null,
    note: `Start daily checks from day ${window.dailyFromDay}, a few days before the farm's earliest roots (common practice).`,
  };
  const phase: ProtocolPhase = {
    kind: lastBase?.kind ?? "cold_moist",
    sources: [farmSource, ...(lastBase?.sources ?? [])],
    note: lastBase?.note ?? "",
  };
  const phases = lastIdx >= 0 ? basePhases.map((p, i) => (i === lastIdx ? phase : p)) : [...basePhases, phase];
  const protocol = toFarmOwnProtocol(
    input.base,
    input.species,
    phases,
    `The farm's own window from its bag history (${window.bags} bags): daily checks from day ${window.dailyFromDay}. Bags already set up keep their window until you change their protocol.`,
  );
  return mutationTable["protocol.upsert"].args.parse({ ...protocol, id: input.id, starter_key: null, source_trial_id: null });
}
