import "server-only";
import { booleanColumns, jsonColumns, type EffectTable } from "@/lib/schemas/mutation-effects";

// Rows cross the wire in the phone's shape: JSON columns as values, booleans as booleans.
// SQLite keeps JSON as text and booleans as 0/1; these two functions translate.

type Row = Record<string, unknown>;

/** A stored row → the shape the phone keeps (and the pull feed sends). */
export function parseRow(table: string, row: Row): Row {
  return parseRowInPlace(table, { ...row });
}

/** parseRow on a row nobody else holds (fresh from the database), without copying it. */
export function parseRowInPlace(table: string, out: Row): Row {
  for (const col of jsonColumns[table as EffectTable] ?? []) {
    const v = out[col];
    if (typeof v === "string") {
      try {
        out[col] = JSON.parse(v);
      } catch {
        out[col] = null;
      }
    }
  }
  for (const col of booleanColumns[table as EffectTable] ?? []) {
    if (col in out && out[col] !== null) out[col] = Boolean(out[col]);
  }
  if ("seq" in out && out.seq !== null) out.seq = Number(out.seq);
  return out;
}

/** Phone-shaped values → column values for knex. */
export function serializeRow(table: string, row: Row): Row {
  const out: Row = { ...row };
  for (const col of jsonColumns[table as EffectTable] ?? []) {
    if (col in out) out[col] = out[col] === null || out[col] === undefined ? null : JSON.stringify(out[col]);
  }
  return out;
}

/** How an audit entry keeps a value: text as is, everything else as JSON, nothing as null. */
export function auditText(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  return typeof value === "string" ? value : JSON.stringify(value);
}
