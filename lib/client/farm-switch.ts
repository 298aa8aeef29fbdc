import type { Role } from "@/lib/schemas/words";
import { getLocalDb, type RimebookDB } from "./db";
import { adoptIdentity, clearFarmCaches, loadIdentity } from "./identity";
import type { PhoneIdentity } from "./meta";
import type { SyncEngine } from "./sync";
import { readWaiting, type WaitingTally } from "./waiting";

// Opening another farm the person belongs to. The phone keeps ONE farm's copy: adopting another
// farm's identity empties it and marks unsent work as refused. So a switch first tries to send what
// is waiting, and refuses while anything of this farm is still only on the phone (waiting changes,
// refused changes whose "Try again" would then go to the other farm, photos). Never loses work,
// never sends one farm's work to another.

export type FarmChoice = { id: string; name: string; role: Role };
/** The identity as GET /api/me and the switch answer it: with the person's farms. */
export type IdentityWithFarms = PhoneIdentity & { farms?: FarmChoice[] };

/** `pending` and `photos` count what the person recorded (`waiting` says what), as the sync pill does. */
export type LeftBehind = { pending: number; refused: number; photos: number; waiting: WaitingTally };
export type SwitchResult =
  | { ok: true; identity: IdentityWithFarms }
  | { ok: false; reason: "unsent"; farmName: string; left: LeftBehind }
  | { ok: false; reason: "server"; status: number; message: string };

type Engine = Pick<SyncEngine, "start" | "stop" | "syncNow">;
type Options = { fetch?: typeof fetch; baseUrl?: string; db?: RimebookDB; engine?: Engine };

/** What of the current farm exists only on this phone. */
export async function countLeftBehind(db: RimebookDB = getLocalDb()): Promise<LeftBehind> {
  // A photo the server refused is still only on this phone: it holds the switch like a waiting one.
  const [waiting, refused] = await Promise.all([readWaiting(db, { refusedPhotosToo: true }), db.outbox.where("status").equals("rejected").count()]);
  return { pending: waiting.records, refused, photos: waiting.photos, waiting };
}

const isClear = (l: LeftBehind) => l.pending + l.refused + l.photos === 0;

/**
 * Switches this phone to `farmId`: pauses the sync loop, sends what is waiting, and only when
 * nothing of the current farm is left on the phone asks the server for a session on the other farm,
 * then starts the phone's copy afresh for it. On refusal the loop is started again as it was.
 * The caller reloads the app on success (every screen then reads the new farm).
 */
export async function switchFarm(farmId: string, { fetch: f = fetch, baseUrl = "", db = getLocalDb(), engine: given }: Options = {}): Promise<SwitchResult> {
  // The app's loop, loaded here if the screen has not yet (it loads after first paint).
  const engine = given ?? (await import("./sync")).getSyncEngine();
  const current = await loadIdentity(db);
  // No new runs start while we switch; a run already going is awaited (and sends what waits).
  engine.stop();
  await engine.syncNow();
  let left = await countLeftBehind(db);
  // The run awaited may have begun before the last write (runs are shared): give that one a fresh run.
  if (left.pending + left.photos > 0) {
    await engine.syncNow();
    left = await countLeftBehind(db);
  }
  if (!isClear(left)) {
    engine.start();
    return { ok: false, reason: "unsent", farmName: current?.farm.name ?? "this farm", left };
  }
  let res: Response;
  try {
    res = await f(`${baseUrl}/api/me/farm`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ farmId }),
      credentials: "same-origin",
      cache: "no-store",
    });
  } catch {
    engine.start();
    return { ok: false, reason: "server", status: 0, message: "No connection right now. Switching farms needs the internet; try again when you have signal." };
  }
  const body = (await res.json().catch(() => null)) as (IdentityWithFarms & { error?: { message: string } }) | null;
  if (!res.ok || !body?.farm) {
    engine.start();
    return { ok: false, reason: "server", status: res.status, message: body?.error?.message ?? "The farm could not be opened. Please try again in a moment." };
  }
  await adoptIdentity(body, db);
  await clearFarmCaches();
  return { ok: true, identity: body };
}
