import type { SyncState } from "./sync";

// The sync loop's light handle. Repository writes nudge the loop, and the sync pill reads its state, without
// importing it: the loop (lib/client/sync.ts, with the pull's apply) loads after a farm screen's first paint
// (`startSyncLoop`), from a chunk the service worker precaches like every other, so it starts with no signal too.
let nudger: (() => void) | null = null;

export function setSyncNudger(fn: (() => void) | null): void {
  nudger = fn;
}

/** Ask the running sync loop (if any) to push soon; debounced there. */
export function nudgeSync(): void {
  nudger?.();
}

/** What the pill shows until the loop has loaded (and on the server). */
export const idleSyncState: SyncState = { phase: "idle", lastSyncAt: null, error: null, firstPull: null, retryAt: null };

type Loop = { getState(): SyncState; subscribe(listener: () => void): () => void };
let loop: Loop | null = null;
let detachLoop: (() => void) | null = null;
const watchers = new Set<() => void>();
const tellWatchers = () => {
  for (const w of watchers) w();
};

/** Called by lib/client/sync.ts whenever the app's loop is made or replaced (sign-out drops it). */
export function attachSyncLoop(next: Loop | null): void {
  if (next === loop) return;
  detachLoop?.();
  loop = next;
  detachLoop = next ? next.subscribe(tellWatchers) : null;
  tellWatchers();
}

/** The loop's state for `useSyncExternalStore`, whichever loop is current. */
export const syncLoopState = {
  subscribe(watcher: () => void): () => void {
    watchers.add(watcher);
    return () => watchers.delete(watcher);
  },
  getState(): SyncState {
    return loop ? loop.getState() : idleSyncState;
  },
};

/** Loads the sync loop (once) and starts it: after first paint, so it never weighs on a screen's first load. */
export function startSyncLoop(): Promise<void> {
  return import("./sync").then((m) => m.getSyncEngine().start());
}

/** Runs the loop now (after an import or a record), loading it first if the screen has not yet. */
export function syncNowSoon(): void {
  void import("./sync").then((m) => m.getSyncEngine().syncNow());
}
