"use client";

import { useEffect, useState, useSyncExternalStore } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb, type OutboxEntry, type PendingPhoto } from "./db";
import { readIdentity, type PhoneIdentity } from "./meta";
import type { SyncState } from "./sync";
import { idleSyncState as syncLoopStateIdle, syncLoopState } from "./sync-signal";
import { nothingWaiting, outboxCounts, type WaitingTally } from "./waiting";

// React reads of the phone store and the sync loop. Components read with these (or useLiveQuery on
// getLocalDb()) and write only through lib/client/repo.ts.

const noCounts = { pending: 0, rejected: 0, photos: 0, waiting: nothingWaiting };

/** `pending` and `photos` count what the person recorded (`waiting` says what); `rejected` counts refused changes and photos. */
export type SyncStatus = SyncState & { pending: number; rejected: number; photos: number; waiting: WaitingTally; online: boolean };

/** Whether the browser thinks it has a network (the sync loop finds out for sure). */
export function useOnline(): boolean {
  return useSyncExternalStore(
    (cb) => {
      window.addEventListener("online", cb);
      window.addEventListener("offline", cb);
      return () => {
        window.removeEventListener("online", cb);
        window.removeEventListener("offline", cb);
      };
    },
    () => navigator.onLine,
    () => true,
  );
}

/**
 * Now on the phone's clock as a label (e.g. "Saturday 5 December"), refreshed each minute; null while the
 * prerendered page hydrates, so a page built on another day never shows (or mismatches on) that day.
 */
export function useClockLabel(format: (now: Date) => string): string | null {
  return useSyncExternalStore(
    (cb) => {
      const timer = window.setInterval(cb, 60_000);
      document.addEventListener("visibilitychange", cb);
      return () => {
        window.clearInterval(timer);
        document.removeEventListener("visibilitychange", cb);
      };
    },
    () => format(new Date()),
    () => null,
  );
}

const idleState = () => syncLoopStateIdle;

/** The sync loop's phase plus live outbox counts, for the status pill and its details. */
export function useSyncStatus(): SyncStatus {
  // The loop itself loads after first paint (startSyncLoop); until then its state is idle.
  const state = useSyncExternalStore(syncLoopState.subscribe, syncLoopState.getState, idleState);
  const counts = useLiveQuery(() => outboxCounts(), [], noCounts) ?? noCounts;
  return { ...state, ...counts, online: useOnline() };
}

/** The signed-in member as this phone remembers it; null when nobody is, undefined while loading. */
export function useIdentity(): PhoneIdentity | null | undefined {
  return useLiveQuery(async () => (await readIdentity(getLocalDb())) ?? null, []);
}

/** Changes the server refused (kept until the person dismisses or retries them), newest first. */
export function useRejectedMutations(): OutboxEntry[] {
  return useLiveQuery(async () => (await getLocalDb().outbox.where("status").equals("rejected").sortBy("n")).reverse(), [], []) ?? [];
}

/** Photos still on the phone (waiting, or refused with a reason). */
export function usePendingPhotos(bagId?: string): PendingPhoto[] {
  return (
    useLiveQuery(() => (bagId ? getLocalDb().pending_photos.where("bag_id").equals(bagId).toArray() : getLocalDb().pending_photos.toArray()), [bagId], []) ?? []
  );
}

/** A displayable address for a photo: the local Blob while it waits, the server's URL once uploaded. */
export function usePhotoSrc(photoId: string | null | undefined): string | null {
  const pending = useLiveQuery(() => (photoId ? getLocalDb().pending_photos.get(photoId) : undefined), [photoId]);
  const [blobUrl, setBlobUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!pending) return setBlobUrl(null);
    const url = URL.createObjectURL(pending.blob);
    setBlobUrl(url);
    return () => URL.revokeObjectURL(url);
  }, [pending]);
  if (!photoId) return null;
  return blobUrl ?? `/api/uploads/${photoId}`;
}

export type RecordSync = "waiting" | "sent" | "refused";

/**
 * Where one saved record is: still waiting on this phone, refused by the server, or sent (no
 * outbox entry for it is left). Undefined while loading.
 */
export function useRecordSync(name: OutboxEntry["name"], rowId: string | null | undefined): RecordSync | undefined {
  return useLiveQuery(async () => {
    if (!rowId) return undefined;
    const entries = await getLocalDb().outbox.filter((e) => e.name === name && (e.args as { id?: unknown } | null)?.id === rowId).toArray();
    if (entries.some((e) => e.status === "rejected")) return "refused";
    return entries.length ? "waiting" : "sent";
  }, [name, rowId]);
}
