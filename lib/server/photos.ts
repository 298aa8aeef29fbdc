import "server-only";
import type { Knex } from "knex";
import { AppError, notFound } from "@/lib/errors";
import { photoLimits } from "@/lib/schemas/photo";
import { nextSeq } from "./seq";
import { readPhotoFile, removePhotoFile, savePhotoFile, sniffImage } from "./storage";

// A photo taken at a check: the bytes on disk, the row synced to every phone of the farm.

export type PhotoUpload = { id: string; bagId: string; checkId: string | null; bytes: Uint8Array };

export const tooLarge = () =>
  new AppError("too_large", `That photo is larger than ${photoLimits.maxBytes / 1024 / 1024} MB. Take it again at a lower size.`, undefined, 413);
export const notAnImage = () =>
  new AppError("unsupported_type", "That file is not a photo Rimebook can keep (JPEG, PNG or WebP).", undefined, 415);

export async function storePhoto(db: Knex, member: { farmId: string; userId: string }, upload: PhotoUpload, now = new Date()) {
  if (upload.bytes.byteLength > photoLimits.maxBytes) throw tooLarge();
  const mime = sniffImage(upload.bytes);
  if (!mime) throw notAnImage();

  const existing = await db("photos").where({ id: upload.id }).first("farm_id");
  if (existing) {
    if (existing.farm_id !== member.farmId) throw notFound("That photo");
    return { id: upload.id, url: photoUrl(upload.id) }; // a retried upload: already stored
  }
  if (!(await db("bags").where({ id: upload.bagId, farm_id: member.farmId }).first("id"))) throw notFound("That bag");
  if (upload.checkId && !(await db("checks").where({ id: upload.checkId, farm_id: member.farmId }).first("id"))) throw notFound("That check");

  const relative = await savePhotoFile(member.farmId, upload.id, mime, upload.bytes);
  try {
    const at = now.toISOString();
    await db.transaction(async (trx) => {
      const seq = await nextSeq(trx, member.farmId);
      await trx("photos").insert({
        id: upload.id, farm_id: member.farmId, created_at: at, updated_at: at, seq, deleted_at: null,
        bag_id: upload.bagId, check_id: upload.checkId, path: relative, mime, bytes: upload.bytes.byteLength, uploaded_by: member.userId,
      });
    });
  } catch (err) {
    await removePhotoFile(relative);
    throw err;
  }
  return { id: upload.id, url: photoUrl(upload.id) };
}

export const photoUrl = (id: string) => `/api/uploads/${id}`;

/** The photo's bytes, only for a member of the farm that owns it. */
export async function readPhoto(db: Knex, farmId: string, id: string): Promise<{ mime: string; bytes: Buffer }> {
  const row = await db("photos").where({ id, farm_id: farmId }).whereNull("deleted_at").first("path", "mime");
  if (!row) throw notFound("That photo");
  return { mime: row.mime, bytes: await readPhotoFile(row.path) };
}
