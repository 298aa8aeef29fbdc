import { ZodError } from "zod";
import { AppError } from "@/lib/errors";

/** One sentence for a failed local save: the schema's own words, or the repository's (sign-in, role). */
export function describeSaveError(e: unknown): string {
  if (e instanceof ZodError) return e.issues.map((i) => i.message).join(" ");
  if (e instanceof AppError) return e.message;
  return "Could not save on this phone. Try again; if it keeps failing, reload the page.";
}
