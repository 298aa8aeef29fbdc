import { randomUUID } from "node:crypto";
import { NextResponse } from "next/server";
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { Id } from "@/lib/schemas/common";
import { photoLimits } from "@/lib/schemas/photo";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readBodyCapped, route } from "@/lib/server/http";
import { notAnImage, storePhoto, tooLarge } from "@/lib/server/photos";

export const dynamic = "force-dynamic";

const UploadFields = z.object({
  id: Id.optional(), // the phone's photo id, so a retried upload is stored once
  bagId: Id,
  checkId: Id.optional(),
});

/** multipart: file, bagId, checkId?, id? → {id, url}. The content decides what the file is, not its name. */
export const POST = route(async (req) => {
  const member = await requireMember(req, "photo.upload");
  // Read at most the cap (plus room for the form's other fields), with or without a content-length.
  const body = await readBodyCapped(req, photoLimits.maxBytes + 64 * 1024, tooLarge);
  let form: FormData;
  try {
    form = await new Response(body as BodyInit, { headers: { "content-type": req.headers.get("content-type") ?? "" } }).formData();
  } catch {
    throw new AppError("bad_request", "Send the photo as a form upload (multipart/form-data).");
  }
  const file = form.get("file");
  if (!(file instanceof Blob)) throw new AppError("invalid", "No photo was attached.", { file: "Attach a photo." });
  if (file.size > photoLimits.maxBytes) throw tooLarge();
  if (file.size === 0) throw notAnImage();
  const fields = UploadFields.parse({
    id: form.get("id") || undefined,
    bagId: form.get("bagId") ?? undefined,
    checkId: form.get("checkId") || undefined,
  });

  const bytes = new Uint8Array(await file.arrayBuffer());
  const stored = await storePhoto(getDb(), member, { id: fields.id ?? randomUUID(), bagId: fields.bagId, checkId: fields.checkId ?? null, bytes });
  return withSessionCookie(NextResponse.json(stored, { status: 201 }), member);
});
