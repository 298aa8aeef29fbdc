import { z } from "zod";

// Columns every synced, farm-owned row carries (ARCHITECTURE.md). Rows travel in this snake_case
// shape everywhere: SQLite, the pull feed, and the phone's Dexie tables.

export const Id = z.uuid({ error: "That id is not a valid UUID." });
export const IsoDay = z.iso.date({ error: "Use a date like 2026-03-15." });
export const IsoTimestamp = z.iso.datetime({ offset: true, error: "Use a date and time like 2026-03-15T08:30:00Z." });

export const SyncColumns = z.object({
  id: Id,
  farm_id: z.string().min(1),
  created_at: IsoTimestamp,
  updated_at: IsoTimestamp,
  seq: z.number().int().nonnegative(),
  deleted_at: IsoTimestamp.nullable(),
});
export type SyncColumns = z.infer<typeof SyncColumns>;

/** The fields a client may not set: the server stamps them. */
export const serverStamped = { farm_id: true, created_at: true, updated_at: true, seq: true, deleted_at: true } as const;

export const optionalText = (max: number) => z.string().trim().max(max, { error: `Keep it under ${max} characters.` }).nullable().default(null);
