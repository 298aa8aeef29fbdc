import { NextResponse } from "next/server";
import { ChangePasswordInput } from "@/lib/schemas/account";
import { requireMember, setSessionCookie } from "@/lib/server/auth";
import { createSession, revokeSession } from "@/lib/server/sessions";
import { changePassword, confirmCurrentPassword } from "@/lib/server/accounts";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { clientAddress } from "@/lib/server/rate-limit";

export const dynamic = "force-dynamic";

/**
 * Current + new password → the new one is set and every other session of the person ends; this
 * phone stays signed in on a new session (the old session's token stops working). A wrong current password is a 400 with a field error and counts toward the
 * sign-in lock (429 once locked).
 */
export const POST = route(async (req) => {
  const input = await readJson(req, ChangePasswordInput);
  const member = await requireMember(req);
  await confirmCurrentPassword(getDb(), { userId: member.userId, email: member.email, password: input.currentPassword, ip: clientAddress(req) });
  // This phone stays signed in on a fresh session: the old session id ends with the old password (OWASP session
  // management: renew the session after a password change).
  const { ended, issued } = await getDb().transaction(async (trx) => {
    const ended = await changePassword(trx, { userId: member.userId, keepSessionId: member.sessionId, password: input.newPassword });
    const issued = await createSession(trx, { userId: member.userId, farmId: member.farmId, userAgent: req.headers.get("user-agent") });
    await revokeSession(trx, member.sessionId);
    return { ended, issued };
  });
  const elsewhere =
    ended === 0 ? "You were not signed in anywhere else." : `You were signed out on ${ended} other phone${ended === 1 ? "" : "s"} or computer${ended === 1 ? "" : "s"}.`;
  return setSessionCookie(NextResponse.json({ ok: true, ended, message: `Password changed. ${elsewhere} This phone stays signed in.` }), issued);
});
