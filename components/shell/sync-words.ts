import type { MutationName } from "@/lib/schemas/mutations";
import type { SyncPhase } from "@/lib/client/sync";
import type { WaitingTally } from "@/lib/client/waiting";

// What the status pill and its details say. Pure, so the wording is tested without a browser.

export type PillTone = "ok" | "calm" | "waiting" | "alert";

export type PillInput = {
  phase: SyncPhase;
  online: boolean;
  pending: number;
  rejected: number;
  photos: number;
  lastSyncAt: string | null;
};

/** "HH:MM" on the phone's clock. */
export function clockTime(iso: string): string {
  const d = new Date(iso);
  return `${String(d.getHours()).padStart(2, "0")}:${String(d.getMinutes()).padStart(2, "0")}`;
}

const waiting = (n: number) => `${n} waiting`;

export function describeSyncStatus(s: PillInput, time: (iso: string) => string = clockTime): { text: string; tone: PillTone } {
  const queued = s.pending + s.photos;
  if (s.phase === "needs_sign_in") return { text: queued ? `Needs sign-in · ${waiting(queued)}` : "Needs sign-in", tone: "alert" };
  if (s.rejected > 0) return { text: `Sync error · ${s.rejected} not saved`, tone: "alert" };
  if (!s.online || s.phase === "offline") return { text: queued ? `Offline · ${waiting(queued)}` : "Offline", tone: "calm" };
  if (s.phase === "error") return { text: queued ? `Sync error · ${waiting(queued)}` : "Sync error", tone: "alert" };
  if (queued) return { text: s.phase === "syncing" ? `Sending ${queued}…` : waiting(queued), tone: "waiting" };
  if (s.phase === "syncing" && !s.lastSyncAt) return { text: "Syncing…", tone: "waiting" };
  if (s.lastSyncAt) return { text: `Synced at ${time(s.lastSyncAt)}`, tone: "ok" };
  return { text: "Not synced yet", tone: "waiting" };
}

/** Each kind of record, one and many, as a person counts what they did. */
export const recordNouns: Record<MutationName, readonly [string, string]> = {
  "farm.update": ["farm settings change", "farm settings changes"],
  "member.preferences": ["e-mail preference", "e-mail preferences"],
  "protocol.upsert": ["protocol", "protocols"],
  "protocol.delete": ["protocol removed", "protocols removed"],
  "lot.create": ["new seed lot", "new seed lots"],
  "lot.update": ["seed lot edit", "seed lot edits"],
  "lot.delete": ["seed lot removed", "seed lots removed"],
  "store.create": ["new cold store", "new cold stores"],
  "store.update": ["cold store edit", "cold store edits"],
  "store.delete": ["cold store removed", "cold stores removed"],
  "reading.record": ["temperature reading", "temperature readings"],
  "bag.create": ["new bag", "new bags"],
  "bag.update": ["bag edit", "bag edits"],
  "bag.pull": ["bag pulled", "bags pulled"],
  "bag.discard": ["bag discarded", "bags discarded"],
  "check.record": ["check", "checks"],
  "sowing.record": ["sowing", "sowings"],
  "count.record": ["germination count", "germination counts"],
  "trial.create": ["new trial", "new trials"],
  "trial.update": ["trial edit", "trial edits"],
  "trial.delete": ["trial removed", "trials removed"],
  "plan.upsert": ["plan item", "plan items"],
  "plan.delete": ["plan item removed", "plan items removed"],
};

const counted = (n: number, [one, many]: readonly [string, string]) => `${n} ${n === 1 ? one : many}`;

/** "2 checks and 1 photo", "1 new bag, 2 checks and 3 photos"; "" when nothing waits. */
export function waitingWords(w: WaitingTally): string {
  const items = [...w.parts.map((p) => counted(p.n, recordNouns[p.name])), ...(w.photos ? [counted(w.photos, ["photo", "photos"])] : [])];
  return items.length <= 1 ? (items[0] ?? "") : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}

/** The pill's count ("3 waiting"), also the first words of the sync details, so both say the same. */
export const waitingCount = (w: WaitingTally) => waiting(w.records + w.photos);

/** "1 check is", "2 checks and 1 photo are". */
export function unsentWords(w: WaitingTally): string {
  return `${waitingWords(w)} ${w.records + w.photos === 1 ? "is" : "are"}`;
}

/** Where a record just saved is now, in one sentence (shown under "saved"). */
export function savedWhereWords(where: "waiting" | "sent" | "refused" | undefined, online: boolean): string {
  if (where === "sent") return "It is on the farm now, for everyone on the crew.";
  if (where === "refused") return "The farm did not take it: tap the sync status at the top to see why.";
  return online ? "Sending it to the farm now." : "It goes to the farm when the phone next has signal.";
}

/** A refused change, named the way the person thinks of it. */
export const mutationWords: Record<MutationName, string> = {
  "farm.update": "Farm settings",
  "member.preferences": "Your e-mail preferences",
  "protocol.upsert": "Protocol saved",
  "protocol.delete": "Protocol removed",
  "lot.create": "New seed lot",
  "lot.update": "Seed lot edit",
  "lot.delete": "Seed lot removed",
  "store.create": "New cold store",
  "store.update": "Cold store edit",
  "store.delete": "Cold store removed",
  "reading.record": "Temperature reading",
  "bag.create": "New bag",
  "bag.update": "Bag edit",
  "bag.pull": "Bag pulled",
  "bag.discard": "Bag discarded",
  "check.record": "Check",
  "sowing.record": "Sowing",
  "count.record": "Germination count",
  "trial.create": "New trial",
  "trial.update": "Trial edit",
  "trial.delete": "Trial removed",
  "plan.upsert": "Plan item",
  "plan.delete": "Plan item removed",
};
