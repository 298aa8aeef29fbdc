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

/** What a grower reads when text holds half of an emoji or symbol (a lone UTF-16 surrogate). */
export const brokenTextMessage = "This has a broken character in it (half of an emoji or symbol). Type it again.";

/**
 * The path of the first string (or key) in a parsed JSON value that holds a lone UTF-16 surrogate, which no
 * UTF-8 text (the database, a CSV) can store; null when all text is well formed.
 */
export function findBrokenText(value: unknown, path: (string | number)[] = []): (string | number)[] | null {
  if (typeof value === "string") return value.isWellFormed() ? null : path;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = findBrokenText(value[i], [...path, i]);
      if (found) return found;
    }
  } else if (value !== null && typeof value === "object") {
    for (const [key, inner] of Object.entries(value)) {
      if (!key.isWellFormed()) return [...path, key];
      const found = findBrokenText(inner, [...path, key]);
      if (found) return found;
    }
  }
  return null;
}
