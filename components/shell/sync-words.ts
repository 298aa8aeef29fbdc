import type { MutationName } from "@/lib/schemas/mutations";
import type { SyncPhase } from "@/lib/client/sync";

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

/** "1 change is", "3 changes and 1 photo are". */
export function unsentWords({ pending, photos }: { pending: number; photos: number }): string {
  const parts = [pending && `${pending} change${pending === 1 ? "" : "s"}`, photos && `${photos} photo${photos === 1 ? "" : "s"}`].filter(Boolean);
  return `${parts.join(" and ")} ${pending + photos === 1 ? "is" : "are"}`;
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
