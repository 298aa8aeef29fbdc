import { formatBagCode, normalizeCrockford, parseBagCode, suggestBagCodes } from "@/lib/domain/bag-codes";
import { readLabelPayload } from "@/lib/domain/label-payload";

// Turning what was typed or scanned into one of this farm's bags, with words a grower understands.
// Pure: the scan screen passes the farm's codes from the phone store.

export type CodeLookup =
  | { kind: "found"; bagId: string; code: string }
  | { kind: "unknown"; code: string; message: string }
  | { kind: "invalid"; message: string; suggestions: string[] }
  | { kind: "not_label"; message: string };

/** Farm bag codes (normalized) → bag id. */
export type FarmCodes = ReadonlyMap<string, string>;

export function indexFarmCodes(bags: readonly { id: string; code: string; deleted_at?: string | null }[]): Map<string, string> {
  const map = new Map<string, string>();
  for (const b of bags) if (!b.deleted_at) map.set(normalizeCrockford(b.code), b.id);
  return map;
}

function findCode(code: string, farm: FarmCodes): CodeLookup {
  const bagId = farm.get(code);
  if (bagId) return { kind: "found", bagId, code };
  return { kind: "unknown", code, message: `No bag with code ${formatBagCode(code)} on this farm.` };
}

/** A code typed by hand: the check character catches a typo, and the farm's codes one slip away are offered. */
export function lookUpTypedCode(text: string, farm: FarmCodes): CodeLookup {
  const parsed = parseBagCode(text);
  if (parsed.ok) return findCode(parsed.code, farm);
  const suggestions =
    parsed.reason === "empty" ? [] : suggestBagCodes(text, [...farm.keys()], 3).map((c) => formatBagCode(c));
  const hint = suggestions.length === 1 ? ` Did you mean ${suggestions[0]}?` : suggestions.length > 1 ? ` Did you mean one of these?` : "";
  return { kind: "invalid", message: parsed.message + hint, suggestions };
}

/** Text read from a QR code by the camera. */
export function lookUpScannedText(text: string, farm: FarmCodes): CodeLookup {
  const read = readLabelPayload(text);
  if (read.ok) return findCode(read.code, farm);
  if (read.reason === "not_rimebook") return { kind: "not_label", message: read.message };
  return { kind: "invalid", message: read.message, suggestions: [] };
}
