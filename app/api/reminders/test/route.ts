import { NextResponse } from "next/server";
import { ReminderDeviceInput } from "@/lib/schemas/reminder";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { sendTestReminder } from "@/lib/server/reminders";

export const dynamic = "force-dynamic";

/** "Send me a test reminder": proves the set-up on this phone now (not counted as the day's reminder). */
export const POST = route(async (req) => {
  const { deviceId } = await readJson(req, ReminderDeviceInput);
  const member = await requireMember(req);
  const result = await sendTestReminder(getDb(), member, deviceId);
  return withSessionCookie(NextResponse.json({ ok: true, ...result }), member);
});
