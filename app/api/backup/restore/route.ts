import { NextResponse } from "next/server";
import { AppError } from "@/lib/errors";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { restoreBackup } from "@/lib/server/restore";

export const dynamic = "force-dynamic";

/** A backup with its pictures can be large; beyond this, restore on the server with a bigger limit. */
const maxBytes = 256 * 1024 * 1024;

/** POST the backup file's JSON: restores it into the Owner's current farm, which must be new and empty. */
export const POST = route(async (req) => {
  const member = await requireMember(req, "farm.restore");
  const declared = Number(req.headers.get("content-length") ?? 0);
  if (declared > maxBytes) throw new AppError("too_large", "This backup is larger than 256 MB, more than this server accepts in one upload.", undefined, 413);
  const text = await req.text();
  if (text.length > maxBytes) throw new AppError("too_large", "This backup is larger than 256 MB, more than this server accepts in one upload.", undefined, 413);
  let parsed: unknown;
  try {
    parsed = JSON.parse(text.replace(/^\uFEFF/, ""));
  } catch {
    parsed = null; // not JSON at all: the restore refuses it in words
  }
  const report = await restoreBackup(getDb(), { farmId: member.farmId, userId: member.userId, email: member.email }, parsed);
  return withSessionCookie(NextResponse.json(report), member);
});
