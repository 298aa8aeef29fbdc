import "server-only";

// The two databases report a broken constraint differently: PostgreSQL by SQLSTATE (23505 unique,
// 23503 foreign key), better-sqlite3 by its extended result code. Callers ask the question once.

type DbError = { code?: unknown; constraint?: unknown; table?: unknown; message?: unknown };

/** A unique or primary-key constraint refused an insert or update (someone else got there first). */
export function isUniqueViolation(err: unknown): boolean {
  const code = (err as DbError | null)?.code;
  return code === "23505" || code === "SQLITE_CONSTRAINT_UNIQUE" || code === "SQLITE_CONSTRAINT_PRIMARYKEY";
}

/** A foreign key refused a row (it points at a row that is not there). */
export function isForeignKeyViolation(err: unknown): boolean {
  const code = (err as DbError | null)?.code;
  return code === "23503" || code === "SQLITE_CONSTRAINT_FOREIGNKEY";
}
