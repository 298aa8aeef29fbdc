import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { attachment, buildBackup } from "@/lib/server/exports";

export const dynamic = "force-dynamic";

/** The Owner's full-farm JSON backup: every farm table, no password hashes, sessions or tokens. */
export const GET = route(async (req) => {
  const member = await requireMember(req, "farm.backup");
  const { fileName, backup } = await buildBackup(getDb(), member.farmId);
  const res = new Response(JSON.stringify(backup, null, 1), {
    headers: {
      "content-type": "application/json; charset=utf-8",
      "content-disposition": attachment(fileName),
      "cache-control": "no-store",
    },
  });
  return withSessionCookie(res, member);
});
