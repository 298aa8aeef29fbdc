import { z } from "zod";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readQuery, route } from "@/lib/server/http";
import { attachment, buildBackup } from "@/lib/server/exports";

export const dynamic = "force-dynamic";

const BackupQuery = z.object({ photos: z.enum(["0", "1"], { error: "photos is 0 or 1." }).default("0") });

/** The Owner's full-farm JSON backup: every farm table, no password hashes, sessions or tokens. ?photos=1 adds the pictures. */
export const GET = route(async (req) => {
  const member = await requireMember(req, "farm.backup");
  const { photos } = readQuery(req, BackupQuery);
  const { fileName, backup } = await buildBackup(getDb(), member.farmId, new Date(), { withPhotos: photos === "1" });
  const res = new Response(JSON.stringify(backup, null, 1), {
    headers: {
      "content-type": "application/json; charset=utf-8",
      "content-disposition": attachment(fileName),
      "cache-control": "no-store",
    },
  });
  return withSessionCookie(res, member);
});
