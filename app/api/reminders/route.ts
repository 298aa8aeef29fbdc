import { NextResponse } from "next/server";
import { ReminderDeviceInput, ReminderStateQuery, ReminderSubscribeInput } from "@/lib/schemas/reminder";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, readQuery, route } from "@/lib/server/http";
import { readReminderState, removeReminder, saveReminder } from "@/lib/server/reminders";

export const dynamic = "force-dynamic";

// Reminders on this phone, for the signed-in person on their current farm. Every role may have them
// (a Helper at the fridge needs the nudge most); the farm is always the session's, never the client's.

/** Whether reminders are possible on this server, the public key to subscribe with, and this phone's time. */
export const GET = route(async (req) => {
  const { deviceId } = readQuery(req, ReminderStateQuery);
  const member = await requireMember(req);
  const state = await readReminderState(getDb(), member, deviceId);
  return withSessionCookie(NextResponse.json(state, { headers: { "cache-control": "no-store" } }), member);
});

/** Remind me on this phone (the browser's push subscription), at this hour on these days. */
export const PUT = route(async (req) => {
  const input = await readJson(req, ReminderSubscribeInput);
  const member = await requireMember(req);
  const time = await getDb().transaction((trx) => saveReminder(trx, member, input));
  return withSessionCookie(NextResponse.json({ ok: true, ...time }), member);
});

/** Stop reminding me on this phone. */
export const DELETE = route(async (req) => {
  const { deviceId } = await readJson(req, ReminderDeviceInput);
  const member = await requireMember(req);
  const removed = await getDb().transaction((trx) => removeReminder(trx, member, deviceId));
  return withSessionCookie(NextResponse.json({ ok: true, removed }), member);
});
