import { ZodError } from "zod";
import { AppError } from "@/lib/errors";

/** Words for a failed save on the phone: the schema's own message, the role/sign-in message, or a calm fallback. */
export function describeSaveError(e: unknown): string {
  if (e instanceof ZodError) {
    const first = e.issues[0];
    return first ? `Not saved: ${first.message}` : "Not saved: some fields need another look.";
  }
  if (e instanceof AppError) return e.message;
  return "Not saved: this phone could not write it. Try again; if it keeps failing, reload the page.";
}
