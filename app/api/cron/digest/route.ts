import { createHash, timingSafeEqual } from "node:crypto";
import { NextResponse } from "next/server";
import { AppError, unauthenticated } from "@/lib/errors";
import { getDb } from "@/lib/server/db";
import { env } from "@/lib/server/env";
import { route } from "@/lib/server/http";
import { runDigestForAllFarms } from "@/lib/server/digest";
import { runReminders } from "@/lib/server/reminders";

export const dynamic = "force-dynamic";

const digestOf = (s: string) => createHash("sha256").update(s).digest();

/**
 * A scheduler calls this with `Authorization: Bearer <CRON_SECRET>`; anyone else gets 401. A production
 * server without CRON_SECRET has the route switched off (404). Compared as equal-length digests in constant
 * time, so neither the secret nor its length shows in the answer time.
 */
function assertCronSecret(req: Request): void {
  if (env.CRON_SECRET === null) {
    throw new AppError("not_found", "The scheduled digest is switched off on this server: set CRON_SECRET to turn it on.", undefined, 404);
  }
  const header = req.headers.get("authorization") ?? "";
  const given = digestOf(header.startsWith("Bearer ") ? header.slice(7).trim() : "");
  if (!header.startsWith("Bearer ") || !timingSafeEqual(given, digestOf(env.CRON_SECRET))) {
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
  // How many, never which: the caller is a scheduler, and farm ids are no business of its logs.
  const count = (status: (typeof outcomes)[number]["status"]) => outcomes.filter((o) => o.status === status).length;
  const reminders = await runReminders(getDb());
  return NextResponse.json(
    {
      ok: true,
      farms: outcomes.length,
      sent: count("sent"),
      alreadySent: count("already_sent"),
      nothingDue: count("nothing_due"),
      noRecipients: count("no_recipients"),
      failed: count("failed"),
      reminders,
    },
    { headers: { "cache-control": "no-store" } },
  );
});

export const GET = runDigest;
export const POST = runDigest;
