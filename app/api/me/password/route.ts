import { NextResponse } from "next/server";
import { ChangePasswordInput } from "@/lib/schemas/account";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { changePassword, confirmCurrentPassword } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { clientAddress } from "@/lib/server/rate-limit";

export const dynamic = "force-dynamic";

/**
 * Current + new password → the new one is set and every other session of the person ends; this
 * one stays signed in. A wrong current password is a 400 with a field error and counts toward the
 * sign-in lock (429 once locked).
 */
export const POST = route(async (req) => {
  const input = await readJson(req, ChangePasswordInput);
  const member = await requireMember(req);
  await confirmCurrentPassword(getDb(), { userId: member.userId, email: member.email, password: input.currentPassword, ip: clientAddress(req) });
  const ended = await getDb().transaction((trx) => changePassword(trx, { userId: member.userId, keepSessionId: member.sessionId, password: input.newPassword }));
  const elsewhere =
    ended === 0 ? "You were not signed in anywhere else." : `You were signed out on ${ended} other phone${ended === 1 ? "" : "s"} or computer${ended === 1 ? "" : "s"}.`;
  return withSessionCookie(NextResponse.json({ ok: true, ended, message: `Password changed. ${elsewhere} This phone stays signed in.` }), member);
});
