import { timingSafeEqual } from "node:crypto";
import { NextResponse } from "next/server";
import { unauthenticated } from "@/lib/errors";
import { getDb } from "@/lib/server/db";
import { env } from "@/lib/server/env";
import { route } from "@/lib/server/http";
import { runDigestForAllFarms } from "@/lib/server/digest";
import { runReminders } from "@/lib/server/reminders";

export const dynamic = "force-dynamic";

/** A scheduler calls this with `Authorization: Bearer <CRON_SECRET>`; anyone else gets 401. */
function assertCronSecret(req: Request): void {
  const header = req.headers.get("authorization") ?? "";
  const given = Buffer.from(header.startsWith("Bearer ") ? header.slice(7).trim() : "");
  const expected = Buffer.from(env.CRON_SECRET);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
    throw unauthenticated("This address is for Rimebook's scheduler and needs its secret.");
  }
}

/**
 * Sends each farm's daily digest for its own today (a second call the same day sends nothing), and in the same
 * pass the phone reminders whose hour has come (call it hourly for those).
 */
const runDigest = route(async (req) => {
  assertCronSecret(req);
  const outcomes = await runDigestForAllFarms(getDb());
  const sent = outcomes.filter((o) => o.status === "sent").length;
  const reminders = await runReminders(getDb());
  return NextResponse.json({ ok: true, farms: outcomes.length, sent, outcomes, reminders }, { headers: { "cache-control": "no-store" } });
});

export const GET = runDigest;
export const POST = runDigest;
