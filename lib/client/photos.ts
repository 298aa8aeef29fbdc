import { AppError } from "@/lib/errors";
import { photoLimits } from "@/lib/schemas/photo";
import { getLocalDb, type RimebookDB } from "./db";
import { nudgeSync } from "./sync-signal";

// Photos taken with no signal wait in the phone store as Blobs; the sync loop uploads each one
// after the bag and check it belongs to have been sent.

export async function queuePhoto(
  input: { bagId: string; checkId?: string | null; blob: Blob; id?: string },
  db: RimebookDB = getLocalDb(),
): Promise<string> {
  const mime = input.blob.type || "image/jpeg";
  if (!(photoLimits.mimes as readonly string[]).includes(mime)) {
    throw new AppError("unsupported_type", "Only photos (JPEG, PNG or WebP) can be kept.", undefined, 415);
  }
  if (input.blob.size > photoLimits.maxBytes) {
    throw new AppError("too_large", `That photo is larger than ${photoLimits.maxBytes / 1024 / 1024} MB.`, undefined, 413);
  }
  const id = input.id ?? crypto.randomUUID();
  await db.pending_photos.put({
    id, bag_id: input.bagId, check_id: input.checkId ?? null, blob: input.blob, mime, created_at: new Date().toISOString(), tries: 0, error: null,
  });
  nudgeSync();
  return id;
}

/** Let go of a photo the server refused (too large, not an image, its bag gone). */
export async function discardPendingPhoto(id: string, db: RimebookDB = getLocalDb()): Promise<void> {
  await db.pending_photos.delete(id);
}

/** Try a refused photo again. */
export async function retryPendingPhoto(id: string, db: RimebookDB = getLocalDb()): Promise<void> {
  await db.pending_photos.update(id, { error: null });
  nudgeSync();
}
