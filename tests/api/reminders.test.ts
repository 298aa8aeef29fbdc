import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";

// Reminders on the phone through the real route handlers, on a fresh SQLite file, delivered over real HTTP to the
// local fake push service (tests/support/push-service.ts), which checks the VAPID signature and decrypts each
// message with the phone's keys as a real push service and phone would (RFC 8030/8291/8292). The farm is invented.

const keys = vi.hoisted(() => {
  // Before lib/server/env.ts is read: this server's VAPID pair, and the fake push service on loopback allowed.
  const webpush = require("web-push") as typeof import("web-push");
  const pair = webpush.generateVAPIDKeys();
  process.env.VAPID_PUBLIC_KEY = pair.publicKey;
  process.env.VAPID_PRIVATE_KEY = pair.privateKey;
  process.env.VAPID_SUBJECT = "mailto:crew@bramblewick.example";
  process.env.PUSH_ALLOW_LOOPBACK = "on";
  return pair;
});

import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { addBag, addCheck, addLot, addProtocol, addStore } from "../support/season-rows";
import { endpointIdOf, startFakePushService, type FakePushService, type FakeSubscription } from "../support/push-service";
import { addDaysToIsoDay } from "@/lib/domain";
import { readZonedClock } from "@/lib/domain/csv";
import { env } from "@/lib/server/env";
import { addMembership } from "@/lib/server/accounts";
import { createSession, SESSION_COOKIE } from "@/lib/server/sessions";
import { runReminders } from "@/lib/server/reminders";
import { DELETE, GET, PUT } from "@/app/api/reminders/route";
import { POST as testReminder } from "@/app/api/reminders/test/route";
import { POST as cronPost } from "@/app/api/cron/digest/route";
import { POST as signOut } from "@/app/api/auth/sign-out/route";
import { POST as signOutEverywhere } from "@/app/api/auth/sign-out-everywhere/route";

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let push: FakePushService;
const noCtx = {} as never;
const ZONE = "America/Chicago";
// A fixed instant: 07:20 in Chicago on Friday 2026-12-04 (13:20 UTC).
const at7 = new Date("2026-12-04T13:20:00Z");
const today = readZonedClock(at7, ZONE).day;
const day = (n: number) => addDaysToIsoDay(today, n);

let owner: TestMember;
let helper: TestMember;
let visitor: TestMember;
let neighbour: TestMember;

const state = async (m: Pick<TestMember, "headers">, deviceId: string) => GET(memberRequest(`/api/reminders?deviceId=${deviceId}`, m), noCtx);
const subscribe = (m: Pick<TestMember, "headers">, deviceId: string, subscription: FakeSubscription, time = { hour: 7, days: [1, 2, 3, 4, 5, 6, 7] }) =>
  PUT(memberRequest("/api/reminders", m, { method: "PUT", json: { deviceId, subscription, ...time } }), noCtx);
const arrivedAt = (s: FakeSubscription) => push.arrived.filter((a) => a.endpointId === endpointIdOf(s));
const rowsOf = (userId: string) => ctx.db("push_subscriptions").where({ user_id: userId });

/** The same person, signed in on a second farm (a new session there, as the farm switch makes). */
async function sameMemberOnFarm(m: TestMember, farmId: string) {
  await ctx.db.transaction((trx) => addMembership(trx, { farmId, userId: m.userId, role: "helper" }));
  const s = await createSession(ctx.db, { userId: m.userId, farmId });
  const cookie = `${SESSION_COOKIE}=${s.token}`;
  return { ...m, farmId, sessionId: s.sessionId, cookie, headers: { cookie, origin: new URL(env.APP_ORIGIN).origin } };
}

beforeAll(async () => {
  ctx = await freshDatabase();
  push = await startFakePushService({ vapidPublicKey: keys.publicKey });
  owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery", name: "Wren" });
  helper = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Ash" });
  visitor = await signedInMember(ctx.db, { role: "visitor", farmId: owner.farmId, name: "Rook" });
  const f = owner.farmId;
  await ctx.db("farms").where({ id: f }).update({ timezone: ZONE });
  // Cold-moist 28–42 days (an invented farm protocol for the test).
  const protocol = await addProtocol(ctx.db, f, "Echinacea purpurea", [28, 42]);
  const lot = await addLot(ctx.db, f, { species: "Echinacea purpurea" });
  await ctx.db("lots").where({ id: lot }).update({ protocol_id: protocol });
  const barn = await addStore(ctx.db, f, { name: "Barn fridge" });
  const cellar = await addStore(ctx.db, f, { name: "Cellar fridge" });
  const bag = (code: string, store: string, start: string) => addBag(ctx.db, f, { code, lotId: lot, storeId: store, protocolId: protocol, start });
  await bag("CCCC33", barn, day(-7)); // first weekly check today
  await bag("BBBB22", barn, day(-45)); // 3 days past the latest pull
  const mouldy = await bag("EEEE55", cellar, day(-10));
  await addCheck(ctx.db, f, mouldy, `${day(-1)}T16:00:00.000Z`, { mould: "spreading", note: "private note: grey fuzz" });
  const rooted = await bag("RRRR11", cellar, day(-30));
  await addCheck(ctx.db, f, rooted, `${day(-1)}T16:00:00.000Z`, { sprouts: "first_roots" });
  await bag("DDDD44", barn, day(-3)); // nothing due

  neighbour = await signedInMember(ctx.db, { role: "owner", farmName: "Neighbour Farm", name: "Lee" });
  await ctx.db("farms").where({ id: neighbour.farmId }).update({ timezone: ZONE });
});
afterAll(async () => {
  await push.close();
  await ctx.cleanup();
});
beforeEach(() => push.clear());

describe("/api/reminders: turning reminders on and off for this phone", () => {
  it("answers whether reminders are possible, with the public key to subscribe with", async () => {
    const res = await state(helper, "helper-phone");
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ available: true, publicKey: keys.publicKey, timezone: ZONE, here: null, elsewhere: null });
  });

  it("lets a Helper and the read-only role subscribe, on their own farm (never one the client names)", async () => {
    const s = push.createSubscription();
    const res = await subscribe(helper, "helper-phone", s, { hour: 7, days: [5, 1, 3, 3] });
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true, hour: 7, days: [1, 3, 5] });
    const v = push.createSubscription();
    // A farm id in the body is not part of the schema and changes nothing.
    const res2 = await PUT(memberRequest("/api/reminders", visitor, { method: "PUT", json: { deviceId: "visitor-phone", subscription: v, hour: 6, days: [1, 2, 3, 4, 5, 6, 7], farmId: neighbour.farmId } }), noCtx);
    expect(res2.status).toBe(200);
    expect(await rowsOf(visitor.userId)).toEqual([expect.objectContaining({ farm_id: owner.farmId, device_id: "visitor-phone", hour: 6, days: "1234567" })]);
    const here = await (await state(helper, "helper-phone")).json();
    expect(here.here).toEqual({ hour: 7, days: [1, 3, 5], endpoint: s.endpoint });
    // Another member's farm sees none of it.
    expect((await (await state(neighbour, "helper-phone")).json()).here).toBeNull();
  });

  it("refuses bad input with words, a push service that is not one, other origins and signed-out callers", async () => {
    const s = push.createSubscription();
    const bad = await subscribe(helper, "helper-phone", s, { hour: 24, days: [] });
    expect(bad.status).toBe(400);
    const body = await bad.json();
    expect(body.error.fields).toMatchObject({ hour: "Choose an hour from 0 to 23.", days: "Choose at least one day." });
    const elsewhere = await subscribe(helper, "helper-phone", { ...s, endpoint: "https://intranet.example/push/1" });
    expect(elsewhere.status).toBe(400);
    expect((await elsewhere.json()).error.fields).toEqual({ "subscription.endpoint": "Not a known push service address." });
    const foreign = await PUT(memberRequest("/api/reminders", helper, { method: "PUT", headers: { origin: "https://evil.example" }, json: { deviceId: "x", subscription: s, hour: 7, days: [1] } }), noCtx);
    expect(foreign.status).toBe(403);
    const anonymous = await PUT(memberRequest("/api/reminders", null, { method: "PUT", json: { deviceId: "x", subscription: s, hour: 7, days: [1] } }), noCtx);
    expect(anonymous.status).toBe(401);
    expect((await anonymous.json()).error.code).toBe("unauthenticated");
  });

  it("a phone that changes hands reminds only its new person", async () => {
    const shared = push.createSubscription();
    const a = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Moss" });
    const b = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Fern" });
    expect((await subscribe(a, "barn-tablet", shared)).status).toBe(200);
    expect((await subscribe(b, "barn-tablet", shared)).status).toBe(200);
    expect(await rowsOf(a.userId)).toHaveLength(0);
    expect(await rowsOf(b.userId)).toHaveLength(1);
    await ctx.db("push_subscriptions").where({ user_id: b.userId }).delete();
  });

  it("unsubscribes this phone only, and only the caller's own", async () => {
    const s = push.createSubscription();
    await subscribe(owner, "owner-phone", s);
    // The neighbour names the owner's phone id: their own rows only, so nothing goes.
    const other = await DELETE(memberRequest("/api/reminders", neighbour, { method: "DELETE", json: { deviceId: "owner-phone" } }), noCtx);
    expect(await other.json()).toEqual({ ok: true, removed: 0 });
    expect(await rowsOf(owner.userId)).toHaveLength(1);
    const mine = await DELETE(memberRequest("/api/reminders", owner, { method: "DELETE", json: { deviceId: "owner-phone" } }), noCtx);
    expect(await mine.json()).toEqual({ ok: true, removed: 1 });
    expect(await rowsOf(owner.userId)).toHaveLength(0);
  });

  it("signing out on a phone removes that phone's reminders; signing out everywhere removes all", async () => {
    const m = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId, name: "Sorrel" });
    const otherPhone = await createSession(ctx.db, { userId: m.userId, farmId: owner.farmId }); // signed in on a second phone
    await subscribe(m, "phone-1", push.createSubscription());
    await subscribe({ headers: { cookie: `${SESSION_COOKIE}=${otherPhone.token}`, origin: new URL(env.APP_ORIGIN).origin } }, "phone-2", push.createSubscription());
    const res = await signOut(memberRequest("/api/auth/sign-out", m, { method: "POST", json: { deviceId: "phone-1" } }), noCtx);
    expect(res.status).toBe(200);
    expect((await rowsOf(m.userId)).map((r: { device_id: string }) => r.device_id)).toEqual(["phone-2"]);
    const again = await signedInMember(ctx.db, { role: "helper", name: "Sorrel again" });
    await subscribe(again, "phone-3", push.createSubscription());
    await subscribe(again, "phone-4", push.createSubscription());
    await signOutEverywhere(memberRequest("/api/auth/sign-out-everywhere", again, { method: "POST", json: {} }), noCtx);
    expect(await rowsOf(again.userId)).toHaveLength(0);
    await ctx.db("push_subscriptions").where({ user_id: m.userId }).delete();
  });
});

describe("the scheduled pass: one reminder per person per farm per day", () => {
  let helperPhone: FakeSubscription;
  let helperTablet: FakeSubscription;

  beforeAll(async () => {
    await ctx.db("push_subscriptions").delete();
    helperPhone = push.createSubscription();
    helperTablet = push.createSubscription();
    await subscribe(helper, "helper-phone", helperPhone, { hour: 7, days: [1, 2, 3, 4, 5, 6, 7] });
    await subscribe(helper, "helper-tablet", helperTablet, { hour: 7, days: [1, 2, 3, 4, 5, 6, 7] });
    await subscribe(visitor, "visitor-phone", push.createSubscription(), { hour: 9, days: [1, 2, 3, 4, 5, 6, 7] });
  });

  it("sends nothing before the chosen hour", async () => {
    const at6 = new Date("2026-12-04T12:59:00Z"); // 06:59 in Chicago
    const tally = await runReminders(ctx.db, at6);
    expect(tally).toMatchObject({ enabled: true, people: 0, sent: 0 });
    expect(push.attempts()).toBe(0);
  });

  it("at the hour, each of the person's phones gets the round: counts by store and the most urgent codes, nothing else", async () => {
    const tally = await runReminders(ctx.db, at7);
    expect(tally).toMatchObject({ people: 1, sent: 2, failed: 0, removed: 0 });
    const [msg] = arrivedAt(helperPhone);
    expect(arrivedAt(helperTablet)).toHaveLength(1);
    // The round of lib/domain (as Today shows it): 4 bags due; mould spreading, roots and an overdue bag listed.
    expect(msg.json).toEqual({
      title: "4 bags to check today",
      body: "Cellar fridge 2 · Barn fridge 2\nMould spreading: EEE-E55\nRoots showing: RRR-R11\nPast latest pull: BBB-B22",
      url: "/today",
      tag: "rimebook-round",
    });
    // No notes, species or people's names cross the push service.
    expect(msg.text).not.toMatch(/grey fuzz|Echinacea|Ash|Bramblewick/);
    expect(msg.topic).toBe("rimebook-round");
    expect(msg.ttl).toBeGreaterThan(0);
    const [run] = await ctx.db("reminder_runs").where({ user_id: helper.userId });
    expect(run).toMatchObject({ farm_id: owner.farmId, day: today, status: "sent", devices: 2, bags: 4 });
  });

  it("a later run the same day (even within the late hours) sends nothing again", async () => {
    const tally = await runReminders(ctx.db, new Date(at7.getTime() + 3600_000));
    expect(tally).toMatchObject({ people: 0, sent: 0, alreadySent: 1 });
    expect(push.arrived).toHaveLength(0);
  });

  it("two job runs at once (through the cron route) send each person one reminder", async () => {
    // Racing through the real route on the real clock: a fresh person whose hour is now on the farm's clock.
    const racer = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Hazel" });
    const now = readZonedClock(new Date(), ZONE);
    const phone = push.createSubscription();
    await subscribe(racer, "racer-phone", phone, { hour: now.hour, days: [now.weekday] });
    const cron = () => cronPost(new Request(new URL("/api/cron/digest", env.APP_ORIGIN), { method: "POST", headers: { authorization: `Bearer ${env.CRON_SECRET}` } }), noCtx);
    const [a, b] = await Promise.all([cron(), cron()]);
    const answers = [await a.json(), await b.json()].map((x) => x.reminders);
    expect(arrivedAt(phone)).toHaveLength(1);
    expect(answers.reduce((n, r) => n + r.sent, 0)).toBeGreaterThanOrEqual(1);
    expect(await ctx.db("reminder_runs").where({ user_id: racer.userId })).toHaveLength(1);
    // And in-process, two passes at once for a second fresh person.
    const twin = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId, name: "Yarrow" });
    const twinPhone = push.createSubscription();
    await subscribe(twin, "twin-phone", twinPhone, { hour: 7, days: [5] });
    const tallies = await Promise.all([runReminders(ctx.db, at7), runReminders(ctx.db, at7)]);
    expect(arrivedAt(twinPhone)).toHaveLength(1);
    expect(tallies.map((t) => t.people).sort()).toEqual([0, 1]);
    expect(tallies.reduce((n, t) => n + t.alreadySent, 0)).toBeGreaterThanOrEqual(2); // helper, and the twin in the losing run
  });

  it("keeps to the chosen days", async () => {
    const m = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Weekend only" });
    const phone = push.createSubscription();
    await subscribe(m, "weekend-phone", phone, { hour: 7, days: [6, 7] }); // Friday is 5
    await runReminders(ctx.db, at7);
    expect(arrivedAt(phone)).toHaveLength(0);
    expect(await ctx.db("reminder_runs").where({ user_id: m.userId })).toHaveLength(0);
  });

  it("a person on two farms gets one reminder per farm, each named", async () => {
    const both = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId, name: "Teasel" });
    const onNeighbour = await sameMemberOnFarm(both, neighbour.farmId);
    const lot = await addLot(ctx.db, neighbour.farmId, { species: "Baptisia australis" });
    const store = await addStore(ctx.db, neighbour.farmId, { name: "Their fridge" });
    await addBag(ctx.db, neighbour.farmId, { code: "ZZZZ99", lotId: lot, storeId: store, start: day(-7) });
    const phone = push.createSubscription();
    // The same phone, once per farm (its browser subscription is the same; the rows are per farm).
    await subscribe(both, "teasel-phone", phone);
    await subscribe(onNeighbour, "teasel-phone", phone);
    expect(await rowsOf(both.userId)).toHaveLength(2);
    await Promise.all([runReminders(ctx.db, at7), runReminders(ctx.db, at7)]);
    const titles = arrivedAt(phone).map((a) => (a.json as { title: string }).title).sort();
    expect(titles).toEqual(["1 bag to check today · Neighbour Farm", "4 bags to check today · Bramblewick Native Nursery"]);
    expect(arrivedAt(phone).find((a) => a.text.includes("Neighbour"))!.text).not.toMatch(/Barn fridge|Cellar/);
  });

  it("nothing due → nothing sent, decided once for the day", async () => {
    const quiet = await signedInMember(ctx.db, { role: "owner", farmName: "Quiet Farm" });
    await ctx.db("farms").where({ id: quiet.farmId }).update({ timezone: ZONE });
    const phone = push.createSubscription();
    await subscribe(quiet, "quiet-phone", phone);
    const tally = await runReminders(ctx.db, at7);
    expect(tally.nothingDue).toBe(1);
    expect(arrivedAt(phone)).toHaveLength(0);
    expect(await ctx.db("reminder_runs").where({ user_id: quiet.userId })).toEqual([expect.objectContaining({ status: "nothing_due" })]);
  });

  it("an expired subscription (410) is removed and counted; the person's other phone still gets it", async () => {
    const m = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Bryony" });
    const old = push.createSubscription();
    const current = push.createSubscription();
    await subscribe(m, "old-phone", old);
    await subscribe(m, "new-phone", current);
    push.answerWith(old.endpoint, 410);
    const tally = await runReminders(ctx.db, at7);
    expect(tally).toMatchObject({ removed: 1, people: 1 });
    expect(arrivedAt(current)).toHaveLength(1);
    expect((await rowsOf(m.userId)).map((r: { device_id: string }) => r.device_id)).toEqual(["new-phone"]);
  });

  it("a hung push service times out without holding up the others; that person is tried again on the next run", async () => {
    const slow = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Slow" });
    const quick = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Quick" });
    const slowPhone = push.createSubscription();
    const quickPhone = push.createSubscription();
    await subscribe(slow, "slow-phone", slowPhone);
    await subscribe(quick, "quick-phone", quickPhone);
    push.answerWith(slowPhone.endpoint, "hang");
    const started = Date.now();
    const tally = await runReminders(ctx.db, at7, { timeoutMs: 400, concurrency: 2 });
    expect(Date.now() - started).toBeLessThan(5000);
    expect(tally).toMatchObject({ people: 1, sent: 1, failed: 1, timedOut: 1 });
    expect(arrivedAt(quickPhone)).toHaveLength(1);
    expect(await ctx.db("reminder_runs").where({ user_id: slow.userId })).toHaveLength(0);
    push.answerWith(slowPhone.endpoint, null);
    const later = await runReminders(ctx.db, new Date(at7.getTime() + 3600_000));
    expect(later).toMatchObject({ people: 1, sent: 1 });
    expect(arrivedAt(slowPhone)).toHaveLength(1);
  });

  it("no reminder after the late hours (a 7 o'clock nudge is not sent at tea time)", async () => {
    const m = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Late" });
    const phone = push.createSubscription();
    await subscribe(m, "late-phone", phone);
    await runReminders(ctx.db, new Date("2026-12-04T23:00:00Z")); // 17:00 in Chicago
    expect(arrivedAt(phone)).toHaveLength(0);
  });

  it("a member removed from the farm is not reminded", async () => {
    const gone = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Left" });
    const phone = push.createSubscription();
    await subscribe(gone, "left-phone", phone);
    await ctx.db("memberships").where({ id: gone.membershipId }).update({ deleted_at: new Date().toISOString() });
    await runReminders(ctx.db, at7);
    expect(arrivedAt(phone)).toHaveLength(0);
  });
});

describe("Send me a test reminder", () => {
  it("sends today's round to this phone now, encrypted and signed, and does not count as the day's reminder", async () => {
    const m = await signedInMember(ctx.db, { role: "visitor", farmId: owner.farmId, name: "Tester" });
    const phone = push.createSubscription();
    await subscribe(m, "test-phone", phone);
    const res = await testReminder(memberRequest("/api/reminders/test", m, { method: "POST", json: { deviceId: "test-phone" } }), noCtx);
    expect(res.status).toBe(200);
    const [msg] = arrivedAt(phone);
    expect(msg.json).toMatchObject({ title: "Rimebook reminders work on this phone", url: "/today", tag: "rimebook-test" });
    expect(await ctx.db("reminder_runs").where({ user_id: m.userId })).toHaveLength(0);
  });

  it("says so when this phone has no reminder, and removes one its push service forgot", async () => {
    const m = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Tester 2" });
    const none = await testReminder(memberRequest("/api/reminders/test", m, { method: "POST", json: { deviceId: "no-phone" } }), noCtx);
    expect(none.status).toBe(404);
    const phone = push.createSubscription();
    await subscribe(m, "gone-phone", phone);
    push.answerWith(phone.endpoint, 410);
    const gone = await testReminder(memberRequest("/api/reminders/test", m, { method: "POST", json: { deviceId: "gone-phone" } }), noCtx);
    expect(gone.status).toBe(409);
    expect((await gone.json()).error.message).toMatch(/Turn reminders on again/);
    expect(await rowsOf(m.userId)).toHaveLength(0);
  });
});

describe("a server without VAPID keys", () => {
  it("turns reminders off and says so; the job sends nothing and does not fail", async () => {
    const saved = env.vapid;
    (env as { vapid: typeof env.vapid }).vapid = null;
    try {
      const st = await (await state(owner, "owner-phone")).json();
      expect(st).toMatchObject({ available: false, publicKey: null });
      const res = await subscribe(owner, "owner-phone", push.createSubscription());
      expect(res.status).toBe(409);
      expect((await res.json()).error.message).toMatch(/turned off on this server/);
      expect(await runReminders(ctx.db, at7)).toMatchObject({ enabled: false, sent: 0 });
      expect(push.attempts()).toBe(0);
    } finally {
      (env as { vapid: typeof env.vapid }).vapid = saved;
    }
  });
});
