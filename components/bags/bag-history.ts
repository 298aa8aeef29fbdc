import type { AuditRow } from "@/lib/client/db";
import { vocabularyLabels, type Medium } from "@/lib/schemas/words";

// The bag's history of edits from the phone's copy of audit_log: each line says which field changed, from what to
// what, who did it and when. Values arrive as the server stored them (plain text, or JSON for anything else).

const fieldLabels: Record<string, string> = {
  store_id: "Cold store",
  box: "Box",
  medium: "Medium",
  note: "Note",
  seed_count: "Seeds",
  start_date: "Start date",
  planned_start_date: "Planned start",
  window_start: "Earliest pull",
  window_end: "Latest pull",
  pulled_on: "Pulled on",
  sown_on: "Sown on",
  discarded_on: "Discarded on",
  discard_reason: "Discard reason",
  protocol_id: "Protocol",
  check_every_days: "Days between checks",
  trial_arm_id: "Trial arm",
  lot_id: "Lot",
  code: "Bag code",
};

export interface HistoryNames {
  stores: ReadonlyMap<string, string>;
  protocols: ReadonlyMap<string, string>;
  members: ReadonlyMap<string, string>;
}

export interface HistoryLine {
  id: number;
  field: string;
  from: string;
  to: string;
  who: string;
  at: string;
}

function showValue(field: string, value: string | null, names: HistoryNames): string {
  if (value === null || value === "") return "(empty)";
  if (field === "store_id") return names.stores.get(value) ?? "a store no longer on this phone";
  if (field === "protocol_id") return names.protocols.get(value) ?? "a protocol no longer on this phone";
  if (field === "medium") return vocabularyLabels.medium[value as Medium] ?? value;
  return value;
}

/** Newest first; ties keep the order the server wrote them. */
export function describeBagHistory(rows: readonly AuditRow[], names: HistoryNames): HistoryLine[] {
  return [...rows]
    .sort((a, b) => (a.at < b.at ? 1 : a.at > b.at ? -1 : b.id - a.id))
    .map((r) => ({
      id: r.id,
      field: fieldLabels[r.field] ?? r.field.replace(/_/g, " "),
      from: showValue(r.field, r.old_value, names),
      to: showValue(r.field, r.new_value, names),
      who: r.user_id ? (names.members.get(r.user_id) ?? "A member") : "Someone",
      at: r.at,
    }));
}
