// `npm run digest`: sends today's digest for every farm (each on its own calendar day) through the
// configured SMTP server (SMTP_URL; the local mail fake by default), then the phone reminders whose hour
// has come. Safe to run twice: a farm's digest goes out once a day, a person's reminder once per farm a day.
import { getDb } from "@/lib/server/db";
import { runDigestForAllFarms } from "@/lib/server/digest";
import { runReminders } from "@/lib/server/reminders";

const words: Record<string, string> = {
  sent: "sent",
  already_sent: "already sent today",
  nothing_due: "nothing due, no e-mail",
  no_recipients: "nobody asked for the digest",
  failed: "not sent (mail server unreachable?); run again later",
};

async function main() {
  const db = getDb();
  try {
    const outcomes = await runDigestForAllFarms(db);
    const names = new Map((await db("farms").select("id", "name")).map((f: { id: string; name: string }) => [f.id, f.name]));
    for (const o of outcomes) {
      const who = o.status === "sent" ? ` to ${o.recipients} member${o.recipients === 1 ? "" : "s"}${o.failed ? ` (${o.failed} failed)` : ""}` : "";
      console.log(`${names.get(o.farmId) ?? o.farmId} · ${o.day}: ${words[o.status]}${who}`);
    }
    if (outcomes.length === 0) console.log("No farms yet.");
    const r = await runReminders(db);
    console.log(
      r.enabled
        ? `Phone reminders: ${r.people} ${r.people === 1 ? "person" : "people"} reminded (${r.sent} sent, ${r.failed} failed${r.timedOut ? `, ${r.timedOut} timed out` : ""}), ${r.removed} expired subscriptions removed, ${r.alreadySent} already reminded today, ${r.nothingDue} with nothing due.`
        : "Phone reminders: off (no VAPID keys set).",
    );
    process.exitCode = outcomes.some((o) => o.status === "failed") || r.failed > 0 ? 1 : 0;
  } finally {
    await db.destroy();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
