// Small readers shared by the bag, lot and protocol forms (react-hook-form's setValueAs and edit patches).

/** A blank text or select is "none" (null) in the schemas. */
export const emptyToNull = (v: unknown) => (v === undefined || (typeof v === "string" && v.trim() === "") ? null : v);

/** A blank number field is null; anything else is read as a number (the schema says when it is not one). */
export const numberOrNull = (v: unknown) => (v === "" || v === null || v === undefined ? null : Number(v));

/** Only the fields the person changed, so an edit never overwrites what someone else changed meanwhile. */
export function pickChanged<T extends Record<string, unknown>>(values: T, dirty: Partial<Record<keyof T, unknown>>): Partial<T> {
  return Object.fromEntries(Object.entries(values).filter(([k]) => Boolean(dirty[k as keyof T]))) as Partial<T>;
}
