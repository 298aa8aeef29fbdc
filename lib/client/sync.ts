import { getLocalDb, type OutboxEntry, type RimebookDB } from "./db";
import { applyEffectsLocally, applyPulledPage, effectsOfEntry, undoRejected, writeTables, type PulledChange } from "./local-apply";
import { META, deviceIdOf, readIdentity, readMeta, writeMeta, type FarmSettings, type PhoneIdentity } from "./meta";
import { attachSyncLoop, idleSyncState, setSyncNudger } from "./sync-signal";
import { outboxCounts } from "./waiting";

// The sync loop: push the outbox in batches, upload waiting photos, pull the farm's changes.
// Runs on start, when the network comes back, on focus, shortly after each local write and on an
// interval; failures back off exponentially with jitter. A 401 stops it with the outbox intact
// until the person signs in again. Nothing in the outbox is ever dropped without the person's say.

export type SyncPhase = "idle" | "syncing" | "offline" | "needs_sign_in" | "error";

export type SyncState = {
  phase: SyncPhase;
  /** ISO time of the last complete push + pull. */
  lastSyncAt: string | null;
  /** The last failure, in words (phase "error" or "offline"). */
  error: string | null;
  /** A new phone's first full pull: rows' seq loaded so far out of the farm's latest. */
  firstPull: { loaded: number; total: number } | null;
  /** When the loop will try again after a failure (ms since epoch), if it is waiting. */
  retryAt: number | null;
};

export type SyncOptions = {
  db?: RimebookDB;
  fetch?: typeof fetch;
  /** "" in the browser (same origin); an absolute origin in tests. */
  baseUrl?: string;
  /** Mutations per push request (the server takes up to 1000). */
  pushBatch?: number;
  /** Rows per pull page. */
  pullPage?: number;
  intervalMs?: number;
  debounceMs?: number;
  baseBackoffMs?: number;
  maxBackoffMs?: number;
  random?: () => number;
};

type PushAnswer = { applied: string[]; rejected: { id: string; error: NonNullable<OutboxEntry["error"]> & { fields?: Record<string, string> } }[] };
type PullAnswer = { cursor: number; changes: PulledChange[]; more: boolean; head: number; farm: FarmSettings; role: PhoneIdentity["role"] };

/** Why a run stopped early. */
class SyncStop extends Error {
  constructor(readonly phase: "offline" | "needs_sign_in" | "error", message: string) {
    super(message);
  }
}

/** Codes the server uses for "not your fault, send it again later". */
const retryableCodes = new Set(["server_error"]);

export class SyncEngine {
  readonly db: RimebookDB;
  private readonly opts: Required<Omit<SyncOptions, "db" | "fetch">> & { fetch: typeof fetch };
  private state: SyncState = idleSyncState;
  private readonly listeners = new Set<() => void>();
  private running: Promise<SyncState> | null = null;
  private again = false;
  private failures = 0;
  private debounceTimer: ReturnType<typeof setTimeout> | null = null;
  private retryTimer: ReturnType<typeof setTimeout> | null = null;
  private intervalTimer: ReturnType<typeof setInterval> | null = null;
  private detach: (() => void) | null = null;

  constructor(options: SyncOptions = {}) {
    this.db = options.db ?? getLocalDb();
    this.opts = {
      fetch: options.fetch ?? ((...a: Parameters<typeof fetch>) => fetch(...a)),
      baseUrl: options.baseUrl ?? "",
      pushBatch: options.pushBatch ?? 500,
      pullPage: options.pullPage ?? 1000,
      intervalMs: options.intervalMs ?? 60_000,
      debounceMs: options.debounceMs ?? 1_500,
      baseBackoffMs: options.baseBackoffMs ?? 2_000,
      maxBackoffMs: options.maxBackoffMs ?? 5 * 60_000,
      random: options.random ?? Math.random,
    };
  }

  getState = (): SyncState => this.state;

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  private set(patch: Partial<SyncState>) {
    this.state = { ...this.state, ...patch };
    for (const l of this.listeners) l();
  }

  /** Starts the triggers (browser only) and runs a first sync. */
  start(): void {
    if (this.detach) return;
    setSyncNudger(() => this.nudge());
    void readMeta<string>(this.db, META.lastSyncAt).then((at) => at && !this.state.lastSyncAt && this.set({ lastSyncAt: at }));
    if (typeof window !== "undefined") {
      const now = () => void this.syncNow();
      const onOffline = () => this.set({ phase: "offline", error: "No signal. Everything is kept on this phone." });
      const onVisible = () => document.visibilityState === "visible" && now();
      window.addEventListener("online", now);
      window.addEventListener("offline", onOffline);
      window.addEventListener("focus", now);
      document.addEventListener("visibilitychange", onVisible);
      this.detach = () => {
        window.removeEventListener("online", now);
        window.removeEventListener("offline", onOffline);
        window.removeEventListener("focus", now);
        document.removeEventListener("visibilitychange", onVisible);
      };
    } else {
      this.detach = () => {};
    }
    this.intervalTimer = setInterval(() => {
      if (typeof document === "undefined" || document.visibilityState === "visible") void this.syncNow();
    }, this.opts.intervalMs);
    void this.syncNow();
  }

  stop(): void {
    this.detach?.();
    this.detach = null;
    setSyncNudger(null);
    for (const t of [this.debounceTimer, this.retryTimer]) if (t) clearTimeout(t);
    if (this.intervalTimer) clearInterval(this.intervalTimer);
    this.debounceTimer = this.retryTimer = this.intervalTimer = null;
  }

  /** After a local write: sync soon, once, however many writes come in the meantime. */
  nudge(): void {
    if (this.debounceTimer) clearTimeout(this.debounceTimer);
    this.debounceTimer = setTimeout(() => {
      this.debounceTimer = null;
      void this.syncNow();
    }, this.opts.debounceMs);
  }

  /** One push + photos + pull; concurrent calls share the run (and ask for one more after it). */
  syncNow(): Promise<SyncState> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      try {
        do {
          this.again = false;
          await this.runOnce();
        } while (this.again && this.state.phase === "idle");
      } finally {
        this.running = null;
      }
      return this.state;
    })();
    return this.running;
  }

  private async runOnce(): Promise<void> {
    const identity = await readIdentity(this.db);
    if (!identity) {
      this.set({ phase: "needs_sign_in", error: null });
      return;
    }
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.retryTimer = null;
    this.set({ phase: "syncing", retryAt: null });
    try {
      await this.push();
      await this.uploadPhotos();
      await this.pull(identity);
      this.failures = 0;
      const at = new Date().toISOString();
      await writeMeta(this.db, META.lastSyncAt, at);
      this.set({ phase: "idle", lastSyncAt: at, error: null, firstPull: null });
    } catch (err) {
      const stop = err instanceof SyncStop ? err : new SyncStop("error", err instanceof Error ? err.message : String(err));
      if (!(err instanceof SyncStop)) console.error("[rimebook] sync failed", err);
      if (stop.phase === "needs_sign_in") {
        this.set({ phase: "needs_sign_in", error: stop.message, retryAt: null });
        return; // wait for sign-in (focus / online / the next write try again)
      }
      this.failures += 1;
      const ceiling = Math.min(this.opts.maxBackoffMs, this.opts.baseBackoffMs * 2 ** (this.failures - 1));
      const delay = Math.round(ceiling * (0.5 + this.opts.random() * 0.5));
      this.set({ phase: stop.phase, error: stop.message, retryAt: Date.now() + delay });
      if (this.detach) {
        this.retryTimer = setTimeout(() => {
          this.retryTimer = null;
          void this.syncNow();
        }, delay);
      }
    }
  }

  private async request(path: string, init: RequestInit = {}, passStatuses: number[] = []): Promise<Response> {
    let res: Response;
    try {
      res = await this.opts.fetch(`${this.opts.baseUrl}${path}`, { credentials: "same-origin", cache: "no-store", ...init });
    } catch {
      throw new SyncStop("offline", "No signal. Everything is kept on this phone and will be sent later.");
    }
    if (res.ok || passStatuses.includes(res.status)) return res;
    if (res.status === 401) throw new SyncStop("needs_sign_in", "Sign in again to send what is waiting on this phone.");
    let message = `The server answered ${res.status}.`;
    try {
      const body = (await res.json()) as { error?: { message?: string } };
      if (body.error?.message) message = body.error.message;
    } catch {
      /* not JSON: keep the status */
    }
    throw new SyncStop("error", message);
  }

  private async push(): Promise<void> {
    const db = this.db;
    const deviceId = await deviceIdOf(db);
    for (;;) {
      const batch = await db.outbox.where("status").equals("pending").limit(this.opts.pushBatch).toArray();
      if (batch.length === 0) return;
      const res = await this.request("/api/sync/push", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ deviceId, mutations: batch.map(({ id, name, args, at }) => ({ id, name, args, at })) }),
      });
      const answer = (await res.json()) as PushAnswer;
      let settled = answer.applied.length;
      await db.transaction("rw", writeTables(db), async () => {
        if (answer.applied.length) await db.outbox.where("id").anyOf(answer.applied).delete();
        let repair = false;
        for (const r of answer.rejected) {
          const entry = await db.outbox.where("id").equals(r.id).first();
          if (!entry || entry.n === undefined) continue;
          if (retryableCodes.has(r.error.code)) {
            await db.outbox.update(entry.n, { tries: entry.tries + 1, error: r.error });
            continue;
          }
          settled += 1;
          // Kept, marked, and shown to the person: a refused record is never silently dropped.
          await db.outbox.update(entry.n, { status: "rejected", tries: entry.tries + 1, error: r.error });
          if (await undoRejected(db, entry)) repair = true;
        }
        if (repair) await writeMeta(db, META.repairPull, true);
      });
      if (settled === 0) throw new SyncStop("error", answer.rejected[0]?.error.message ?? "The server did not take the waiting changes.");
    }
  }

  private async uploadPhotos(): Promise<void> {
    const db = this.db;
    // A photo belongs to a bag and a check: send it once nothing it depends on is still waiting.
    if ((await db.outbox.where("status").equals("pending").count()) > 0) return;
    for (const photo of await db.pending_photos.toArray()) {
      if (photo.error) continue; // refused before: waits for the person to look at it
      const form = new FormData();
      form.append("file", photo.blob, `${photo.id}.${photo.mime.split("/")[1] ?? "img"}`);
      form.append("id", photo.id);
      form.append("bagId", photo.bag_id);
      if (photo.check_id) form.append("checkId", photo.check_id);
      const res = await this.request("/api/uploads", { method: "POST", body: form }, [400, 404, 413, 415]);
      if (res.ok) {
        await db.pending_photos.delete(photo.id);
        continue;
      }
      let message = `Upload refused (${res.status}).`;
      try {
        message = ((await res.json()) as { error: { message: string } }).error.message;
      } catch {
        /* keep the status */
      }
      await db.pending_photos.update(photo.id, { tries: photo.tries + 1, error: message });
    }
  }

  private async pull(identity: PhoneIdentity): Promise<void> {
    const db = this.db;
    const repair = (await readMeta<boolean>(db, META.repairPull)) === true;
    let cursor = repair ? 0 : ((await readMeta<number>(db, META.cursor)) ?? 0);
    const first = (await readMeta<boolean>(db, META.firstPullDone)) !== true;
    const stamp = { farmId: identity.farm.id, userId: identity.user.id, at: new Date().toISOString() };
    for (;;) {
      const res = await this.request(`/api/sync/pull?since=${cursor}&limit=${this.opts.pullPage}`);
      const page = (await res.json()) as PullAnswer;
      await db.transaction("rw", writeTables(db), async () => {
        await applyPulledPage(db, page.changes, stamp);
        await writeMeta(db, META.cursor, page.cursor);
        const current = (await readIdentity(db)) ?? identity;
        await writeMeta(db, META.identity, { ...current, role: page.role ?? current.role, farm: { ...current.farm, ...page.farm } });
        if (!page.more) {
          await writeMeta(db, META.firstPullDone, true);
          await writeMeta(db, META.repairPull, false);
        }
      });
      if (first) this.set({ firstPull: { loaded: Math.min(page.cursor, page.head), total: page.head } });
      if (!page.more || page.cursor <= cursor) return;
      cursor = page.cursor;
    }
  }
}

export { outboxCounts };

/** The person read a refused change and lets it go (its rows were already undone on this phone). */
export async function dismissRejected(mutationId: string, db: RimebookDB = getLocalDb()): Promise<void> {
  await db.outbox.where("id").equals(mutationId).and((e) => e.status === "rejected").delete();
}

/** Whether a refused change may be sent by whoever is signed in now: another person's work (or another farm's) never is. */
export function canRetryAs(entry: Pick<OutboxEntry, "error">, identity: Pick<PhoneIdentity, "user" | "farm"> | null | undefined): boolean {
  const by = entry.error?.recordedBy;
  if (!by) return entry.error?.code !== "other_account";
  return Boolean(identity && identity.user.id === by.userId && identity.farm.id === by.farmId);
}

export type RetryResult = { ok: true } | { ok: false; message: string };

/** Send a refused change once more (e.g. after the owner changed the person's role). */
export async function retryRejected(mutationId: string, db: RimebookDB = getLocalDb()): Promise<RetryResult> {
  const entry = await db.outbox.where("id").equals(mutationId).first();
  if (!entry || entry.n === undefined || entry.status !== "rejected") return { ok: true };
  const identity = await readIdentity(db);
  if (!canRetryAs(entry, identity)) {
    return { ok: false, message: "This was recorded by someone else, or on another farm. Only they can send it, signed in on that farm on this phone." };
  }
  await db.transaction("rw", writeTables(db), async () => {
    await db.outbox.update(entry.n!, { status: "pending", error: null });
    if (identity) {
      await applyEffectsLocally(db, effectsOfEntry(entry), { farmId: identity.farm.id, userId: identity.user.id, at: entry.at });
    }
  });
  getSyncEngine().nudge();
  return { ok: true };
}

let engine: SyncEngine | null = null;

/** The app's one sync loop (created on first use with browser defaults). */
export function getSyncEngine(): SyncEngine {
  if (!engine) {
    engine = new SyncEngine();
    attachSyncLoop(engine);
  }
  return engine;
}

/** Tests and sign-out replace or drop the loop. */
export function setSyncEngine(next: SyncEngine | null): void {
  engine?.stop();
  engine = next;
  attachSyncLoop(next);
}
