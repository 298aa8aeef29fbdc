import { NextResponse } from "next/server";
import { clearSessionCookie, requireMember } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { revokeAllSessions } from "@/lib/server/sessions";
import { forgetAllReminders } from "@/lib/server/reminders";

export const dynamic = "force-dynamic";

/** Ends every session of the signed-in person, on every phone and computer and every farm; no phone reminds them. */
export const POST = route(async (req) => {
  const member = await requireMember(req);
  const ended = await revokeAllSessions(getDb(), member.userId);
  await forgetAllReminders(getDb(), member.userId);
  return clearSessionCookie(NextResponse.json({ ok: true, ended }));
});
