import { readRole, type Role } from "@/lib/schemas/words";
import type { RimebookDB } from "./db";

// Keys of the phone store's meta table, and the identity the app needs to open with no signal.

export const META = {
  identity: "identity",
  deviceId: "device_id",
  cursor: "cursor",
  lastSyncAt: "last_sync_at",
  firstPullDone: "first_pull_done",
  repairPull: "repair_pull",
  /** A new id each time the farm's copy is emptied, so what screens kept of the old copy is never taken for the new. */
  farmCopy: "farm_copy",
} as const;

export type FarmSettings = {
  id: string;
  name: string;
  last_frost_date?: string | null;
  location_note?: string | null;
  temperature_unit?: string;
  weekly_check_days?: number;
  timezone?: string;
};

/** The signed-in member as the phone remembers it: {user, farm, role}, as GET /api/me answers. */
export type PhoneIdentity = {
  user: { id: string; name: string; email: string };
  farm: FarmSettings;
  role: Role;
};

/**
 * The one way the phone reads its identity: roles go through readRole, so a phone that last
 * synced before "viewer" became "visitor" reads itself (and its other farms) as a Visitor. A role
 * it does not know reads as the least one (a Visitor can change nothing); the next pull
 * brings the server's word.
 */
export function identityFrom<T extends PhoneIdentity>(value: T | undefined): T | undefined {
  if (!value) return value;
  const role = readRole;
  const farms = (value as { farms?: unknown }).farms;
  return {
    ...value,
    role: role(value.role),
    ...(Array.isArray(farms) ? { farms: farms.map((f: { role?: unknown }) => ({ ...f, role: role(f.role) })) } : {}),
  };
}

export async function readIdentity<T extends PhoneIdentity = PhoneIdentity>(db: RimebookDB): Promise<T | undefined> {
  return identityFrom(await readMeta<T>(db, META.identity));
}

export async function readMeta<T>(db: RimebookDB, key: string): Promise<T | undefined> {
  return (await db.meta.get(key))?.value as T | undefined;
}

export async function writeMeta(db: RimebookDB, key: string, value: unknown): Promise<void> {
  await db.meta.put({ key, value });
}

/** This browser profile's id, sent with every push (kept across sign-outs). */
export async function deviceIdOf(db: RimebookDB): Promise<string> {
  const existing = await readMeta<string>(db, META.deviceId);
  if (existing) return existing;
  const id = crypto.randomUUID();
  await writeMeta(db, META.deviceId, id);
  return id;
}

/** Whether the phone has pulled the farm once (its own module-light home: the scanner needs only this). */
export async function loadFarmFetched(db: RimebookDB): Promise<boolean> {
  return (await readMeta<boolean>(db, META.firstPullDone)) === true;
}
