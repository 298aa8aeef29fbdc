import { SCREENS_CACHE_PREFIX } from "./cache-names";
import { farmTables, getLocalDb, type RimebookDB } from "./db";
import { META, readIdentity, readMeta, writeMeta, type PhoneIdentity } from "./meta";
import { readWaiting, type WaitingTally } from "./waiting";

// Who is using this phone. Kept in the phone store so the app opens with no signal; refreshed from
// GET /api/me when there is. Sign-out empties the phone store and the caches (after a warning when
// unsent work would be lost).

type Net = { fetch?: typeof fetch; baseUrl?: string; db?: RimebookDB };

export async function loadIdentity(db: RimebookDB = getLocalDb()): Promise<PhoneIdentity | null> {
  return (await readIdentity(db)) ?? null;
}

/**
 * Remembers the signed-in member. A different person or farm on this phone starts from an empty
 * farm copy; their predecessor's unsent records stay visible as refused (never sent under the new name).
 */
/**
 * Empties the phone's copy of the farm's records and its pull cursor (call inside a Dexie transaction over those
 * tables), so the next sync fetches the farm afresh: after a switch of person or farm, and after a restore.
 */
export async function clearFarmCopy(db: RimebookDB): Promise<void> {
  await Promise.all([...farmTables.map((t) => db.table(t).clear()), db.audit_log.clear()]);
  await db.meta.bulkDelete([META.cursor, META.firstPullDone, META.repairPull, META.lastSyncAt]);
  await writeMeta(db, META.farmCopy, crypto.randomUUID());
}

/** After a restore the server's farm is new from end to end: the phone drops its copy and fetches it again. */
export async function refetchFarmCopy(db: RimebookDB = getLocalDb()): Promise<void> {
  await db.transaction("rw", [...farmTables.map((t) => db.table(t)), db.audit_log, db.meta], () => clearFarmCopy(db));
}

export async function adoptIdentity(me: PhoneIdentity, db: RimebookDB = getLocalDb()): Promise<void> {
  const prev = await loadIdentity(db);
  const samePerson = prev && prev.user.id === me.user.id && prev.farm.id === me.farm.id;
  await db.transaction("rw", [...farmTables.map((t) => db.table(t)), db.audit_log, db.outbox, db.meta, db.pending_photos], async () => {
    if (prev && !samePerson) {
      await clearFarmCopy(db);
      await db.pending_photos.clear();
      await db.outbox
        .where("status")
        .equals("pending")
        .modify({
          status: "rejected",
          error: {
            code: "other_account",
            message: `Recorded while ${prev.user.name} was signed in at ${prev.farm.name}; sign in as them, on that farm, to send it.`,
            recordedBy: { userId: prev.user.id, farmId: prev.farm.id },
          },
        });
    }
    await writeMeta(db, META.identity, { ...me, farm: { ...(samePerson ? prev.farm : {}), ...me.farm } });
  });
}

/** Asks the server who is signed in: the identity, null (signed out: 401), or "offline". */
export async function refreshIdentity({ fetch: f = fetch, baseUrl = "", db = getLocalDb() }: Net = {}): Promise<PhoneIdentity | null | "offline"> {
  let res: Response;
  try {
    res = await f(`${baseUrl}/api/me`, { credentials: "same-origin", cache: "no-store" });
  } catch {
    return "offline";
  }
  if (res.status === 401) return null;
  if (!res.ok) return "offline";
  const me = (await res.json()) as PhoneIdentity;
  await adoptIdentity(me, db);
  return me;
}

export type SignOutResult = { ok: true } | { ok: false; waiting: WaitingTally };

/**
 * Signs out: refuses (with the counts, so the screen can warn) while unsent work is on the phone,
 * unless `force`. Then ends the session, empties the phone store and every cache that may hold
 * this farm's data; the precached app shell (no farm data in it) stays so the app still opens.
 */
export async function signOut({ force = false, fetch: f = fetch, baseUrl = "", db = getLocalDb() }: Net & { force?: boolean } = {}): Promise<SignOutResult> {
  // Counted as recorded (as the pill does); a photo the server refused is still only here, so it counts too.
  const waiting = await readWaiting(db, { refusedPhotosToo: true });
  if (waiting.records + waiting.photos > 0 && !force) return { ok: false, waiting };
  try {
    // The phone's id lets the server drop this phone's reminders with the session.
    const deviceId = await readMeta<string>(db, META.deviceId);
    await f(`${baseUrl}/api/auth/sign-out`, { method: "POST", credentials: "same-origin", headers: { "content-type": "application/json" }, body: JSON.stringify(deviceId ? { deviceId } : {}) });
  } catch {
    /* offline: the cookie is cleared server-side at its expiry; the phone forgets it now */
  }
  // Loaded only here (sign-out is rare), so neither weighs on a screen's first load.
  const [{ dropPushSubscription }, { setSyncEngine }] = await Promise.all([import("./reminders"), import("./sync")]);
  await dropPushSubscription();
  setSyncEngine(null); // stops the loop
  await wipePhoneStore(db);
  await clearFarmCaches();
  return { ok: true };
}

/** Everything but the device id. */
export async function wipePhoneStore(db: RimebookDB = getLocalDb()): Promise<void> {
  const deviceId = await readMeta<string>(db, META.deviceId);
  await db.transaction("rw", db.tables, async () => {
    await Promise.all(db.tables.map((t) => t.clear()));
    if (deviceId) await writeMeta(db, META.deviceId, deviceId);
  });
  // Only the device id stays: what screens kept of the farm's readings in this tab goes too (loaded here,
  // not with the shell: a wipe is rare).
  (await import("./kept-readings")).forgetKeptReadings(db);
}

/** Runtime caches (API answers, visited pages, photos) go; the build's precache and screen payloads (no farm data) stay. */
export async function clearFarmCaches(): Promise<void> {
  if (typeof caches === "undefined") return;
  for (const name of await caches.keys()) {
    if (!name.includes("precache") && !name.startsWith(SCREENS_CACHE_PREFIX)) await caches.delete(name);
  }
}
