import type { MutationName } from "@/lib/schemas/mutations";
import { getLocalDb, type OutboxEntry, type PendingPhoto, type RimebookDB } from "./db";

// What is still only on this phone, counted the way the person recorded it. One save can write
// several outbox entries (a check with a temperature is a check and a store reading; two edits of
// one bag are two entries): the pill, the sync details, sign-out and farm switching all count
// records from here, so every screen says the same number for the same work.

export type WaitingPart = { name: MutationName; n: number };

export type WaitingTally = {
  /** Records waiting to be sent (not outbox entries). */
  records: number;
  /** Photos waiting to upload (refused ones are not waiting: they wait for the person). */
  photos: number;
  /** Records by kind, in the order they were first recorded. */
  parts: WaitingPart[];
};

export const nothingWaiting: WaitingTally = { records: 0, photos: 0, parts: [] };

type Entry = Pick<OutboxEntry, "name" | "args">;

const argsOf = (e: Entry): Record<string, unknown> => (e.args && typeof e.args === "object" ? (e.args as Record<string, unknown>) : {});

/** Pure: outbox entries (in outbox order) and the number of waiting photos → what the person recorded. */
export function tallyWaiting(entries: readonly Entry[], photos: number): WaitingTally {
  const checkIds = new Set(entries.filter((e) => e.name === "check.record").map((e) => argsOf(e).id));
  const seen = new Set<string>();
  const counts = new Map<MutationName, number>();
  for (const entry of entries) {
    const args = argsOf(entry);
    // A temperature typed into a check is written as a store reading too; the person recorded one check.
    if (entry.name === "reading.record" && args.check_id && checkIds.has(args.check_id)) continue;
    // Several edits of one row (or of the farm's settings) are one change to it.
    const key = `${entry.name}:${typeof args.id === "string" ? args.id : ""}`;
    if (seen.has(key)) continue;
    seen.add(key);
    counts.set(entry.name, (counts.get(entry.name) ?? 0) + 1);
  }
  const parts = [...counts].map(([name, n]) => ({ name, n }));
  return { records: parts.reduce((s, p) => s + p.n, 0), photos, parts };
}

/** Photos still uploading vs. refused by the server (those wait for the person, like refused changes). */
export function splitPhotos(photos: readonly Pick<PendingPhoto, "error">[]): { waiting: number; refused: number } {
  const refused = photos.filter((p) => p.error).length;
  return { waiting: photos.length - refused, refused };
}

/**
 * The phone store's waiting work, counted as recorded. With `refusedPhotosToo`, photos the server refused
 * count as well: before the phone store is emptied (sign-out, farm switch) they are still only here.
 */
export async function readWaiting(db: RimebookDB = getLocalDb(), { refusedPhotosToo = false } = {}): Promise<WaitingTally> {
  const [entries, photos] = await Promise.all([db.outbox.where("status").anyOf("pending", "sending").sortBy("n"), db.pending_photos.toArray()]);
  return tallyWaiting(entries, refusedPhotosToo ? photos.length : splitPhotos(photos).waiting);
}

/**
 * What waits on this phone, counted as the person recorded it, and what the server refused (changes and photos,
 * shown until the person decides): the sync pill's counts.
 */
export async function outboxCounts(db: RimebookDB = getLocalDb()): Promise<{ pending: number; rejected: number; photos: number; waiting: WaitingTally }> {
  const [entries, rejected, photos] = await Promise.all([
    db.outbox.where("status").anyOf("pending", "sending").sortBy("n"),
    db.outbox.where("status").equals("rejected").count(),
    db.pending_photos.toArray(),
  ]);
  const split = splitPhotos(photos);
  const waiting = tallyWaiting(entries, split.waiting);
  return { pending: waiting.records, rejected: rejected + split.refused, photos: waiting.photos, waiting };
}
