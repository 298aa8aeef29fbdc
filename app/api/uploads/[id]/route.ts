import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { readPhoto } from "@/lib/server/photos";
import { Id } from "@/lib/schemas/common";
import { notFound } from "@/lib/errors";

export const dynamic = "force-dynamic";

/** A photo's bytes for members of its farm; anyone else gets 404. */
export const GET = route<{ params: Promise<{ id: string }> }>(async (req, { params }) => {
  const member = await requireMember(req);
  const { id } = await params;
  if (!Id.safeParse(id).success) throw notFound("That photo");
  const photo = await readPhoto(getDb(), member.farmId, id);
  return withSessionCookie(
    new Response(new Uint8Array(photo.bytes), {
      headers: { "content-type": photo.mime, "cache-control": "private, max-age=31536000, immutable", "x-content-type-options": "nosniff" },
    }),
    member,
  );
});
