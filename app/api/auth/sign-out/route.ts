import { NextResponse } from "next/server";
import { assertSameOrigin, clearSessionCookie, readSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { readSession, revokeSession } from "@/lib/server/sessions";
import { forgetRemindersAtSignOut } from "@/lib/server/reminders";
import { ReminderDeviceInput } from "@/lib/schemas/reminder";

export const dynamic = "force-dynamic";

/** Ends this session (the row is revoked, so a copied cookie stops working too); this phone's reminders stop. */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  // The phone may say which it is ({deviceId}); signing out never fails over the body.
  const device = ReminderDeviceInput.safeParse(await req.json().catch(() => null));
  const active = await readSession(readSessionCookie(req));
  if (active) {
    await revokeSession(getDb(), active.session.id);
    await forgetRemindersAtSignOut(getDb(), active.session, device.success ? device.data.deviceId : null);
  }
  return clearSessionCookie(NextResponse.json({ ok: true }));
});
