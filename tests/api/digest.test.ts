import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { signedInMember, type TestMember } from "../support/auth";
import { addBag, addCheck, addLot, addProtocol, addReading, addStore } from "../support/season-rows";
import { env } from "@/lib/server/env";
import { useSmtp } from "@/lib/server/mail";
import { readMailbox, startMailFake, type MailFake } from "@/lib/server/mail-fake";
import { runFarmDigest } from "@/lib/server/digest";
import { addDaysToIsoDay } from "@/lib/domain";
import { findZonedDay } from "@/lib/domain/csv";
import { GET, POST } from "@/app/api/cron/digest/route";

// The digest through a real SMTP conversation with the local fake (smtp-server, started in-process on a
// free port), on a fresh SQLite file, through the real cron route. The farm is invented (Bramblewick);
// its days are set relative to today so the real clock drives the route.

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let mail: MailFake;
let mailDir: string;
let owner: TestMember;
let grower: TestMember;
let helper: TestMember;
let neighbour: TestMember;
const now = new Date();
const today = findZonedDay(now, "UTC");
const day = (n: number) => addDaysToIsoDay(today, n);
const hoursAgo = (h: number) => new Date(now.getTime() - h * 3_600_000).toISOString();

const optIn = (m: TestMember) => ctx.db("memberships").where({ id: m.membershipId }).update({ digest_opt_in: true });
const cron = (method: "GET" | "POST", auth?: string) =>
  (method === "GET" ? GET : POST)(new Request(new URL("/api/cron/digest", env.APP_ORIGIN), { method, headers: auth ? { authorization: auth } : {} }), {} as never);
const mailTo = (email: string) => readMailbox(mailDir).filter((m) => m.to.includes(email));

beforeAll(async () => {
  ctx = await freshDatabase();
  mailDir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-digest-mail-"));
  mail = await startMailFake({ port: 0, dir: mailDir, quiet: true });
  useSmtp(`smtp://127.0.0.1:${mail.port}`);

  owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery", name: "Wren" });
  grower = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId, name: "Tam" });
  helper = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId, name: "Ash" });
  await optIn(owner);
  await optIn(grower);
  const f = owner.farmId;
  // Cold-moist 28–42 days (an invented farm protocol for the test).
  const protocol = await addProtocol(ctx.db, f, "Echinacea purpurea", [28, 42]);
  const lot = await addLot(ctx.db, f, { species: "Echinacea purpurea" });
  await ctx.db("lots").where({ id: lot }).update({ common_name: "Purple coneflower", protocol_id: protocol });
  const fridge = await addStore(ctx.db, f, { name: "Barn fridge" });
  const bag = (code: string, start: string) => addBag(ctx.db, f, { code, lotId: lot, storeId: fridge, protocolId: protocol, start, box: "Box A" });
  await bag("AAAA11", day(-28)); // window opens today
  await bag("BBBB22", day(-45)); // latest pull was 3 days ago
  await bag("CCCC33", day(-7)); // first weekly check today
  await bag("DDDD44", day(-3)); // nothing due
  await bag("GGGG77", day(-9)); // its weekly check two days ago was missed
  const ownRhythm = await bag("JJJJ99", day(-3)); // checked every 3 days (the bag's own setting): due today
  await ctx.db("bags").where({ id: ownRhythm }).update({ check_every_days: 3 });
  // Pulled and not sown: one five days ago with no roots (late: common practice sows within 3 days), one today with roots.
  const longOut = await bag("KKKK12", day(-40));
  await ctx.db("bags").where({ id: longOut }).update({ pulled_on: day(-5) });
  const sprouted = await bag("MMMM34", day(-35));
  await addCheck(ctx.db, f, sprouted, `${today}T08:00:00.000Z`, { sprouts: "first_roots" });
  await ctx.db("bags").where({ id: sprouted }).update({ pulled_on: today });
  const mouldy = await bag("EEEE55", day(-10));
  await addCheck(ctx.db, f, mouldy, `${day(-1)}T16:00:00.000Z`, { mould: "spots", moisture: "soggy", note: "grey fuzz <one corner>" });
  const older = await bag("FFFF66", day(-12));
  await addCheck(ctx.db, f, older, `${day(-3)}T09:00:00.000Z`, { mould: "spots" });
  await addCheck(ctx.db, f, older, `${day(-2)}T09:00:00.000Z`);

  // The barn fridge's door was left ajar: above 10 °C from 12 h ago until 2 h ago (10 h: under half a day, no day lost).
  for (const [h, c] of [[30, 4], [20, 4.5], [12, 11.5], [8, 12], [2, 4.2]] as const) await addReading(ctx.db, f, fridge, hoursAgo(h), c);
  // The dairy fridge was warm (14 °C) from 5 days ago to 3 days ago: its bag lost 2 days of cold, so its window,
  // planned to open 2 days ago, opens today (the phone's effective window, lib/domain).
  const dairy = await addStore(ctx.db, f, { name: "Dairy fridge" });
  await addBag(ctx.db, f, { code: "HHHH88", lotId: lot, storeId: dairy, protocolId: protocol, start: day(-30), box: "Box A" });
  for (let h = 8 * 24; h >= 6; h -= 6) await addReading(ctx.db, f, dairy, hoursAgo(h), h <= 5 * 24 && h > 3 * 24 ? 14 : 4);
  const freezer = await addStore(ctx.db, f, { name: "Chest freezer", kind: "freezer" });
  for (const h of [20, 10, 1]) await addReading(ctx.db, f, freezer, hoursAgo(h), -18);
  const frame = await addStore(ctx.db, f, { name: "North cold frame", kind: "cold_frame" });
  for (const h of [20, 10, 1]) await addReading(ctx.db, f, frame, hoursAgo(h), -6); // a cold frame's frost is its treatment

  neighbour = await signedInMember(ctx.db, { role: "owner", farmName: "Neighbour Farm", name: "Lee" });
  await optIn(neighbour);
  const theirLot = await addLot(ctx.db, neighbour.farmId, { species: "Baptisia australis" });
  const theirStore = await addStore(ctx.db, neighbour.farmId, { name: "Their fridge" });
  await addBag(ctx.db, neighbour.farmId, { code: "ZZZZ99", lotId: theirLot, storeId: theirStore, start: day(-7) });
});
afterAll(async () => {
  await mail.close();
  fs.rmSync(mailDir, { recursive: true, force: true });
  await ctx.cleanup();
});

describe("/api/cron/digest", () => {
  it("refuses callers without the scheduler's secret (401), GET or POST", async () => {
    for (const method of ["GET", "POST"] as const) {
      for (const auth of [undefined, "Bearer wrong-secret", `Basic ${env.CRON_SECRET}`, env.CRON_SECRET ?? ""]) {
        const res = await cron(method, auth);
        expect(res.status).toBe(401);
        expect((await res.json()).error.code).toBe("unauthenticated");
      }
    }
    expect(readMailbox(mailDir)).toHaveLength(0);
    expect(await ctx.db("digest_runs")).toHaveLength(0);
  });

  it("sends each opted-in member the farm's digest over SMTP, and nobody else", async () => {
    const res = await cron("POST", `Bearer ${env.CRON_SECRET}`);
    expect(res.status).toBe(200);
    const body = await res.json();
    // How many farms, never which (issue 11): each farm's outcome shows in its digest_runs row.
    expect(body).toMatchObject({ ok: true, farms: 2, sent: 2, failed: 0 });
    expect(JSON.stringify(body)).not.toContain(owner.farmId);
    expect(await ctx.db("digest_runs").where({ farm_id: neighbour.farmId })).toEqual([expect.objectContaining({ day: today, recipients: 1 })]);
    expect(mailTo(owner.email)).toHaveLength(1);
    expect(mailTo(grower.email)).toHaveLength(1);
    expect(mailTo(helper.email)).toHaveLength(0); // did not opt in
    expect(readMailbox(mailDir)).toHaveLength(3);
  });

  it("says what is due in plain text: the round, windows opening, overdue pulls, mould yesterday, excursions", () => {
    const [m] = mailTo(owner.email);
    expect(m.subject).toMatch(/^Bramblewick Native Nursery · \w+day \d+ \w+: 4 bags to check, 2 windows opening, 1 past the latest pull, 2 to sow \(1 late\), mould found yesterday, a cold store left its band$/);
    const text = m.text;
    expect(text).toMatch(/^Good morning Wren,/);
    // The round: the weekly check and the mould follow-up (lib/domain schedule), not the bag with nothing due.
    expect(text).toContain("Bags to check today (4)");
    expect(text).toContain("- JJJ-J99 · Echinacea purpurea (Purple coneflower) · Barn fridge, Box A: Routine check (this bag: every 3 days).");
    expect(text).toContain(`- GGG-G77 · Echinacea purpurea (Purple coneflower) · Barn fridge, Box A: Routine check. (due since ${day(-2)})`);
    expect(text).toContain("- CCC-C33 · Echinacea purpurea (Purple coneflower) · Barn fridge, Box A: Routine check.");
    expect(text).toMatch(/- EEE-E55 · .*: Look again for mould spots\./);
    expect(text).not.toContain("DDD-D44");
    const opening = text.split("Pull windows opening today (2)\n")[1]?.split("\n\n")[0] ?? "";
    expect(opening).toContain(`- AAA-A11 · Echinacea purpurea (Purple coneflower) · Barn fridge, Box A: Open until ${day(14)}`);
    // Planned 28–42 days from day −30, moved 2 days by the warm spell: opens today, open until day 14.
    expect(opening).toContain(`- HHH-H88 · Echinacea purpurea (Purple coneflower) · Dairy fridge, Box A: Open until ${day(14)}`);
    expect(text).not.toMatch(/Bags to check today[^]*HHH-H88[^]*Pull windows opening/);
    expect(text).toContain(`Past the latest pull date (1)\n- BBB-B22 · Echinacea purpurea (Purple coneflower) · Barn fridge, Box A: 3 days past the latest pull date (${day(-3)})`);
    // Mould from yesterday's check only (not the one three days ago), with the caution.
    expect(text).toContain("Mould found yesterday (1)\n- EEE-E55");
    expect(text).toContain("mould spots, look again today (“grey fuzz <one corner>”)");
    expect(text).not.toMatch(/Mould found yesterday[^]*FFF-F66/);
    expect(text).toContain("Caution: Mouldy material: discard it sealed, do not sniff or inhale it, and wash your hands.");
    // The fridge's excursion from its readings (lib/domain cold exposure, default band 0–10 °C); freezer and cold frame quiet.
    expect(text).toMatch(/Barn fridge: warmer than 10\.0 °C .* to .*; warmest 12\.0 °C \(band 0\.0 °C to 10\.0 °C\)\./);
    expect(text).not.toContain("Chest freezer:");
    expect(text).not.toContain("North cold frame");
    expect(text).toContain(`Open today's round: ${new URL("/today", env.APP_ORIGIN)}`);
    expect(text).toContain("Turn it off in Settings");
    expect(text).not.toContain("ZZZ");
  });

  it("lists pulled bags waiting to be sown, the late one flagged first (lib/domain sowing rule)", () => {
    const [m] = mailTo(owner.email);
    const section = m.text.split("Pulled, waiting to be sown (2, 1 late)\n")[1]?.split("\n\n")[0] ?? "";
    const lines = section.split("\n");
    expect(lines[0]).toBe(`- LATE · KKK-K12 · Echinacea purpurea (Purple coneflower): 5 days out of the cold: late to sow (sow by ${day(-2)}). Sow now, or note why it waits.`);
    expect(lines[1]).toBe("- MMM-M34 · Echinacea purpurea (Purple coneflower): Pulled today, roots showing: sow by tomorrow; the young roots break easily.");
    // A pulled bag is no longer in the round of checks.
    expect(m.text).not.toMatch(/Bags to check today[^]*KKK-K12[^]*Pulled, waiting/);
  });

  it("and the same words as simple HTML, escaped", () => {
    const [m] = mailTo(grower.email);
    expect(m.text).toMatch(/^Good morning Tam,/);
    expect(m.html).toContain("<h2");
    expect(m.html).toContain("<li>CCC-C33 · Echinacea purpurea (Purple coneflower) · Barn fridge, Box A: Routine check.</li>");
    expect(m.html).toContain("grey fuzz &lt;one corner&gt;");
    expect(m.html).not.toContain("<one corner>");
  });

  it("keeps each farm's digest to its own bags", () => {
    const [m] = mailTo(neighbour.email);
    expect(m.subject).toMatch(/^Neighbour Farm · .*: 1 bag to check$/);
    expect(m.text).toContain("ZZZ-Z99 · Baptisia australis");
    expect(m.text).not.toContain("Echinacea");
  });

  it("is idempotent per farm per day: a second run (GET this time) sends nothing", async () => {
    const res = await cron("GET", `Bearer ${env.CRON_SECRET}`);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.sent).toBe(0);
    expect(body).toMatchObject({ farms: 2, alreadySent: 2 });
    expect(readMailbox(mailDir)).toHaveLength(3);
    const runs = await ctx.db("digest_runs").where({ farm_id: owner.farmId });
    expect(runs).toEqual([expect.objectContaining({ day: today, recipients: 2 })]);
  });

  it("two runs at once still send one digest", async () => {
    const farm = await signedInMember(ctx.db, { role: "owner", farmName: "Racing Farm" });
    await optIn(farm);
    const lot = await addLot(ctx.db, farm.farmId);
    await addBag(ctx.db, farm.farmId, { code: "RRRR77", lotId: lot, storeId: null, start: day(-7) });
    const outcomes = await Promise.all([runFarmDigest(ctx.db, farm.farmId, now), runFarmDigest(ctx.db, farm.farmId, now)]);
    expect(outcomes.map((o) => o.status).sort()).toEqual(["already_sent", "sent"]);
    expect(mailTo(farm.email)).toHaveLength(1);
  });

  it("when the mail server is down, records nothing so a later run sends the digest", async () => {
    const farm = await signedInMember(ctx.db, { role: "owner", farmName: "Offline Farm" });
    await optIn(farm);
    const lot = await addLot(ctx.db, farm.farmId);
    await addBag(ctx.db, farm.farmId, { code: "QQQQ88", lotId: lot, storeId: null, start: day(-7) });
    useSmtp("smtp://127.0.0.1:9"); // nothing listens there
    try {
      expect(await runFarmDigest(ctx.db, farm.farmId, now)).toMatchObject({ status: "failed", failed: 1 });
      expect(await ctx.db("digest_runs").where({ farm_id: farm.farmId })).toHaveLength(0);
    } finally {
      useSmtp(`smtp://127.0.0.1:${mail.port}`);
    }
    expect(await runFarmDigest(ctx.db, farm.farmId, now)).toMatchObject({ status: "sent", recipients: 1 });
    expect(mailTo(farm.email)).toHaveLength(1);
  });

  it("a farm with nothing due sends no e-mail (and does not try again that day)", async () => {
    const farm = await signedInMember(ctx.db, { role: "owner", farmName: "Quiet Farm" });
    await optIn(farm);
    expect(await runFarmDigest(ctx.db, farm.farmId, now)).toMatchObject({ status: "nothing_due" });
    expect(mailTo(farm.email)).toHaveLength(0);
    expect(await runFarmDigest(ctx.db, farm.farmId, now)).toMatchObject({ status: "already_sent" });
  });

  it("shows temperatures in °F for a farm that reads °F", async () => {
    const farm = await signedInMember(ctx.db, { role: "owner", farmName: "Fahrenheit Farm" });
    await optIn(farm);
    await ctx.db("farms").where({ id: farm.farmId }).update({ temperature_unit: "F" });
    const fridge = await addStore(ctx.db, farm.farmId, { name: "Porch fridge" });
    for (const [h, c] of [[20, 4], [10, 12], [3, 4]] as const) await addReading(ctx.db, farm.farmId, fridge, hoursAgo(h), c);
    expect(await runFarmDigest(ctx.db, farm.farmId, now)).toMatchObject({ status: "sent" });
    const [m] = mailTo(farm.email);
    // 12 °C = 53.6 °F and 10 °C = 50 °F (NIST SP 811 conversion).
    expect(m.text).toMatch(/Porch fridge: warmer than 50\.0 °F .*; warmest 53\.6 °F \(band 32\.0 °F to 50\.0 °F\)\./);
  });
});
