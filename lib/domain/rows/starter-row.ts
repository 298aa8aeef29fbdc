import type { ProtocolRow } from "@/lib/client/db";
import { starterProtocols, type StarterProtocol } from "@/lib/domain/starter-protocols";
import { readProtocolRow } from "./protocol-row";

// Stored protocol rows beside the starter library. Apart from ./protocol-row so the screens that only read rows
// (Today, the check sheet, the bags) do not load the starter library and its cautions with their first load.

/** The starter library row a stored protocol was installed from, if any (it keeps citations for rows without phases). */
export function findStarterFor(row: Pick<ProtocolRow, "starter_key">): StarterProtocol | null {
  if (!row.starter_key) return null;
  return starterProtocols.find((s) => s.key === row.starter_key) ?? null;
}

/** Every citation behind a protocol row: its phases' sources, plus the starter row's own (e.g. "none required" rows). */
export function listProtocolCitations(row: ProtocolRow): string[] {
  const fromPhases = readProtocolRow(row).phases.flatMap((p) => p.sources.map((s) => s.citation));
  const fromStarter = findStarterFor(row)?.citations ?? [];
  return [...new Set([...fromPhases, ...fromStarter])];
}
