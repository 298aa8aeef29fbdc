import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { AppError, notFound } from "@/lib/errors";
import { isKnownTimeZone, readZonedClock } from "@/lib/domain/csv";
import { composeReminder, composeTestReminder, isReminderDue } from "@/lib/domain/reminder";
import type { ReminderMessage, ReminderState, ReminderSubscribeInput, ReminderTime } from "@/lib/schemas/reminder";
import type { Member } from "./auth";
import { loadFarmRound } from "./digest";
import { env } from "./env";
import { deliverPush, isAcceptedEndpoint, mapWithConcurrency, type Delivery, type PushTarget } from "./push";

// Reminders on the phone: each member chooses, per farm, an hour on the farm's clock and the days; each phone
// they turn it on for holds a push subscription. The scheduled pass (the digest's cron route and `npm run digest`)
// sends each person at most one reminder per farm per day: a reminder_runs row is claimed (insert-or-ignore on its
// primary key) before anything is sent, so two job runs at once cannot both send.

const offMessage = "Phone reminders are turned off on this server: the farm's administrator has not set up its push keys yet. The daily e-mail still works.";

type SubscriptionRow = {
  id: string;
  farm_id: string;
  user_id: string;
  device_id: string;
  endpoint: string;
  p256dh: string;
  auth: string;
  hour: number;
  days: string;
  updated_at: string;
};

const daysToText = (days: readonly number[]) => [...new Set(days)].sort().join("");
const daysFromText = (text: string) => [...String(text)].map(Number).filter((d) => d >= 1 && d <= 7);
const timeOf = (row: Pick<SubscriptionRow, "hour" | "days">): ReminderTime => ({ hour: Number(row.hour), days: daysFromText(row.days) });

async function farmTimezone(db: Knex | Knex.Transaction, farmId: string): Promise<string> {
  const farm = await db("farms").where({ id: farmId }).first("timezone");
  return farm && isKnownTimeZone(farm.timezone) ? farm.timezone : "UTC";
}

/** What Settings shows: are reminders possible here, and this phone's (or the person's other phones') time. */
export async function readReminderState(db: Knex, member: Member, deviceId: string): Promise<ReminderState> {
  const rows: SubscriptionRow[] = await db("push_subscriptions").where({ farm_id: member.farmId, user_id: member.userId }).orderBy("updated_at", "desc");
  const here = rows.find((r) => r.device_id === deviceId);
  return {
    available: env.vapid !== null,
    publicKey: env.vapid?.publicKey ?? null,
    timezone: await farmTimezone(db, member.farmId),
    here: here ? { ...timeOf(here), endpoint: here.endpoint } : null,
    elsewhere: rows[0] ? timeOf(rows[0]) : null,
  };
}

function assertAvailable(): void {
  if (!env.vapid) throw new AppError("conflict", offMessage, undefined, 409);
}

/**
 * Turns reminders on for this member on this phone, or changes the hour and days (which are the person's, so
 * their other phones on this farm follow). An endpoint belongs to one phone: rows of other people that still
 * name it (the phone changed hands) are removed, so nobody gets someone else's reminders.
 */
export async function saveReminder(trx: Knex.Transaction, member: Member, input: ReminderSubscribeInput, now = new Date()): Promise<ReminderTime> {
  assertAvailable();
  if (!isAcceptedEndpoint(input.subscription.endpoint)) {
    throw new AppError("invalid", "This phone's push service is not one Rimebook can send to.", { "subscription.endpoint": "Not a known push service address." });
  }
  const at = now.toISOString();
  const days = daysToText(input.days);
  await trx("push_subscriptions").where({ endpoint: input.subscription.endpoint }).whereNot({ user_id: member.userId }).delete();
  await trx("push_subscriptions")
    .insert({
      id: randomUUID(),
      farm_id: member.farmId,
      user_id: member.userId,
      device_id: input.deviceId,
      session_id: member.sessionId,
      endpoint: input.subscription.endpoint,
      p256dh: input.subscription.keys.p256dh,
      auth: input.subscription.keys.auth,
      hour: input.hour,
      days,
      created_at: at,
      updated_at: at,
      last_sent_at: null,
    })
    .onConflict(["farm_id", "user_id", "device_id"])
    .merge(["session_id", "endpoint", "p256dh", "auth", "hour", "days", "updated_at"]);
  await trx("push_subscriptions").where({ farm_id: member.farmId, user_id: member.userId }).update({ hour: input.hour, days, updated_at: at });
  return { hour: input.hour, days: daysFromText(days) };
}

/** Stops reminders on this phone for this member on this farm. */
export async function removeReminder(trx: Knex.Transaction, member: Member, deviceId: string): Promise<number> {
  return trx("push_subscriptions").where({ farm_id: member.farmId, user_id: member.userId, device_id: deviceId }).delete();
}

/** Signing out on a phone: its reminders stop, for every farm the person had turned them on for there. */
export async function forgetRemindersAtSignOut(db: Knex | Knex.Transaction, session: { id: string; user_id: string }, deviceId: string | null): Promise<number> {
  return db("push_subscriptions")
    .where({ user_id: session.user_id })
    .andWhere((q) => {
      q.where({ session_id: session.id });
      if (deviceId) q.orWhere({ device_id: deviceId });
    })
    .delete();
}

/** Signing out everywhere: no phone of the person keeps reminding them. */
export async function forgetAllReminders(db: Knex | Knex.Transaction, userId: string): Promise<number> {
  return db("push_subscriptions").where({ user_id: userId }).delete();
}

/** "Send me a test reminder": today's round (or a word that nothing is due) to this phone now. */
export async function sendTestReminder(db: Knex, member: Member, deviceId: string, now = new Date()): Promise<{ delivered: true }> {
  assertAvailable();
  const row: SubscriptionRow | undefined = await db("push_subscriptions").where({ farm_id: member.farmId, user_id: member.userId, device_id: deviceId }).first();
  if (!row) throw notFound("A reminder on this phone");
  const farm = await db("farms").where({ id: member.farmId }).first("id", "timezone", "weekly_check_days");
  const timezone = isKnownTimeZone(farm.timezone) ? farm.timezone : "UTC";
  const round = await loadFarmRound(db, { ...farm, timezone }, readZonedClock(now, timezone).day, now);
  const result = await deliverPush(row, composeTestReminder(round), { ttlSeconds: 600 });
  if (result.outcome === "delivered") return { delivered: true };
  if (result.outcome === "gone") {
    await db("push_subscriptions").where({ id: row.id }).delete();
    throw new AppError("conflict", "This phone's push service no longer knows it (the browser dropped the subscription). Turn reminders on again.", undefined, 409);
  }
  throw new AppError(
    "conflict",
    result.reason === "timeout" ? "The phone's push service did not answer in time. Try again in a minute." : "The phone's push service refused the test reminder. Try again later.",
    undefined,
    502,
  );
}

// ---- The scheduled pass ----

export type ReminderTally = {
  /** False when the server has no VAPID keys (nothing is tried). */
  enabled: boolean;
  /** People reminded in this run (one per person per farm). */
  people: number;
  /** Messages accepted by push services (one per phone). */
  sent: number;
  /** Messages not accepted: timeouts, errors, refusals (a later run that day tries again). */
  failed: number;
  timedOut: number;
  /** Subscriptions removed because the push service answered 404/410. */
  removed: number;
  /** People already reminded today (an earlier or concurrent run). */
  alreadySent: number;
  /** People due a reminder with nothing due on the farm: nothing sent. */
  nothingDue: number;
};

export type ReminderRunOptions = { concurrency?: number; timeoutMs?: number };

type Person = { farmId: string; userId: string; time: ReminderTime; subs: SubscriptionRow[] };
type FarmInfo = { id: string; name: string; timezone: string; weekly_check_days: number | null };

/** Claims the person's reminder for the day; false when an earlier or concurrent run already has it. */
async function claimReminder(db: Knex, p: Person, day: string, status: "sending" | "nothing_due", now: Date): Promise<boolean> {
  const inserted = await db("reminder_runs")
    .insert({ farm_id: p.farmId, user_id: p.userId, day, status, devices: 0, bags: 0, decided_at: now.toISOString() })
    .onConflict(["farm_id", "user_id", "day"])
    .ignore()
    .returning(["farm_id"]);
  return inserted.length === 1;
}

/**
 * Sends every reminder that is due at `now` (each farm on its own clock). One push service being slow or down
 * holds up nobody: each request has a timeout and at most `concurrency` run at once.
 */
export async function runReminders(db: Knex, now = new Date(), opts: ReminderRunOptions = {}): Promise<ReminderTally> {
  const tally: ReminderTally = { enabled: env.vapid !== null, people: 0, sent: 0, failed: 0, timedOut: 0, removed: 0, alreadySent: 0, nothingDue: 0 };
  if (!env.vapid) return tally;

  const rows: (SubscriptionRow & { farm_name: string; timezone: string; weekly_check_days: number | null })[] = await db("push_subscriptions as p")
    .join("memberships as m", function () {
      this.on("m.farm_id", "=", "p.farm_id").andOn("m.user_id", "=", "p.user_id");
    })
    .join("farms as f", "f.id", "p.farm_id")
    .join("users as u", "u.id", "p.user_id")
    .whereNull("m.deleted_at")
    .whereNull("f.deleted_at")
    .whereNull("u.deleted_at")
    .orderBy("p.updated_at", "desc")
    .select("p.*", "f.name as farm_name", "f.timezone", "f.weekly_check_days");
  if (rows.length === 0) return tally;

  // Group by farm, then person; the person's most recent choice of hour and days counts.
  const farms = new Map<string, { farm: FarmInfo; people: Map<string, Person> }>();
  for (const r of rows) {
    let f = farms.get(r.farm_id);
    if (!f) {
      const timezone = isKnownTimeZone(r.timezone) ? r.timezone : "UTC";
      f = { farm: { id: r.farm_id, name: r.farm_name, timezone, weekly_check_days: r.weekly_check_days }, people: new Map() };
      farms.set(r.farm_id, f);
    }
    let p = f.people.get(r.user_id);
    if (!p) f.people.set(r.user_id, (p = { farmId: r.farm_id, userId: r.user_id, time: timeOf(r), subs: [] }));
    p.subs.push(r);
  }

  // People on several farms see the farm's name in the message, so they know which fridges are meant.
  const userIds = [...new Set(rows.map((r) => r.user_id))];
  const farmCounts: { user_id: string; n: number | string }[] = await db("memberships as m")
    .join("farms as f", "f.id", "m.farm_id")
    .whereIn("m.user_id", userIds)
    .whereNull("m.deleted_at")
    .whereNull("f.deleted_at")
    .groupBy("m.user_id")
    .select("m.user_id")
    .count({ n: "*" });
  const onSeveralFarms = new Set(farmCounts.filter((c) => Number(c.n) > 1).map((c) => c.user_id));

  type Job = { person: Person; day: string; bags: number; message: ReminderMessage; sub: SubscriptionRow };
  const jobs: Job[] = [];
  for (const { farm, people } of farms.values()) {
    const clock = readZonedClock(now, farm.timezone);
    const due = [...people.values()].filter((p) => isReminderDue(p.time, clock));
    if (due.length === 0) continue;
    const decided = new Set(
      (await db("reminder_runs").where({ farm_id: farm.id, day: clock.day }).whereIn("user_id", due.map((p) => p.userId)).select("user_id")).map((r: { user_id: string }) => r.user_id),
    );
    const waiting = due.filter((p) => !decided.has(p.userId));
    tally.alreadySent += due.length - waiting.length;
    if (waiting.length === 0) continue;
    let round;
    try {
      round = await loadFarmRound(db, farm, clock.day, now);
    } catch (err) {
      console.error(`[rimebook] reminders: the round of one farm could not be built: ${(err as Error).message}`);
      tally.failed += waiting.reduce((n, p) => n + p.subs.length, 0);
      continue;
    }
    for (const person of waiting) {
      const message = composeReminder(round, { farmName: onSeveralFarms.has(person.userId) ? farm.name : null });
      if (!message) {
        if (await claimReminder(db, person, clock.day, "nothing_due", now)) tally.nothingDue++;
        else tally.alreadySent++;
        continue;
      }
      if (!(await claimReminder(db, person, clock.day, "sending", now))) {
        tally.alreadySent++;
        continue;
      }
      for (const sub of person.subs) jobs.push({ person, day: clock.day, bags: round.items.length, message, sub });
    }
  }

  const results: Delivery[] = await mapWithConcurrency(jobs, opts.concurrency ?? 8, (j) =>
    deliverPush(j.sub, j.message, { timeoutMs: opts.timeoutMs ?? 10_000, topic: "rimebook-round" }),
  );

  // Per person: delivered to at least one phone → the day is done; otherwise the claim is released so a later
  // run (within the late hours) tries again.
  const byPerson = new Map<string, { job: Job; delivered: string[] }>();
  for (let i = 0; i < jobs.length; i++) {
    const job = jobs[i];
    const key = `${job.person.farmId}|${job.person.userId}`;
    const entry = byPerson.get(key) ?? { job, delivered: [] };
    byPerson.set(key, entry);
    const r = results[i];
    if (r.outcome === "delivered") {
      tally.sent++;
      entry.delivered.push(job.sub.id);
    } else if (r.outcome === "gone") {
      tally.removed++;
      await db("push_subscriptions").where({ id: job.sub.id }).delete();
    } else {
      tally.failed++;
      if (r.reason === "timeout") tally.timedOut++;
    }
  }
  const at = new Date().toISOString();
  for (const { job, delivered } of byPerson.values()) {
    const where = { farm_id: job.person.farmId, user_id: job.person.userId, day: job.day };
    if (delivered.length === 0) {
      await db("reminder_runs").where({ ...where, status: "sending" }).delete();
      continue;
    }
    tally.people++;
    await db("reminder_runs").where(where).update({ status: "sent", devices: delivered.length, bags: job.bags, decided_at: at });
    await db("push_subscriptions").whereIn("id", delivered).update({ last_sent_at: at });
  }
  return tally;
}
