import "server-only";
import { isUniqueViolation } from "./db-errors";
import type { Knex } from "knex";
import { buildBagRows } from "@/lib/domain/rows/bag-rows";
import { buildRoundFromRows, buildSowQueueFromRows, cadenceFor, type LastCheckRow } from "@/lib/domain/rows/round-input";
import { findZonedDay, isKnownTimeZone } from "@/lib/domain/csv";
import {
  addDaysToIsoDay,
  countDaysBetween,
  defaultEffectiveBand,
  formatBagCode,
  formatTemperature,
  measureColdExposure,
  mouldCaution,
  type Excursion,
  type TemperatureUnit,
  type TodaysRound,
} from "@/lib/domain";
import type { TemperatureBand } from "@/lib/schemas/protocol";
import { vocabularyLabels, type Mould } from "@/lib/schemas/vocabulary";
import { appLink, sendMail, type Mail } from "./mail";
import { parseRow } from "./sync/rows";
import { farmWindowClock, loadBagRowSources, loadSpeciesWindows, type BagRowSourcesWithReadings } from "./bag-rows";

// The daily digest: once per farm per day, to the members who asked for it, what the bags and
// cold stores need today. The same lib/domain round the phone shows on Today, worked out on the
// server for the farm's own calendar day. digest_runs makes a second run that day send nothing.

export interface DigestBag {
  code: string;
  species: string;
  place: string;
  note: string;
}

export interface DigestMould {
  code: string;
  species: string;
  place: string;
  mould: Mould;
  note: string | null;
}

export interface DigestExcursion {
  store: string;
  kind: "above" | "below";
  from: string;
  to: string;
  ongoing: boolean;
  hours: number;
  peakC: number;
  band: TemperatureBand;
}

export interface FarmDigest {
  farm: { id: string; name: string; timezone: string; unit: TemperatureUnit };
  day: string;
  due: DigestBag[];
  windowsOpening: DigestBag[];
  overdue: DigestBag[];
  /** Pulled bags not yet sown, late ones first (lib/domain sowing rule). */
  toSow: (DigestBag & { late: boolean })[];
  mouldYesterday: DigestMould[];
  excursions: DigestExcursion[];
}

export const isEmptyDigest = (d: FarmDigest) =>
  d.due.length + d.windowsOpening.length + d.overdue.length + d.toSow.length + d.mouldYesterday.length + d.excursions.length === 0;

/** The band a store is held to in the digest. A fridge: the product's default cold band (0–10 °C, REFERENCES.md). */
function storeBand(kind: string): TemperatureBand | null {
  if (kind === "fridge") return defaultEffectiveBand;
  // A freezer's frozen phase needs the seed kept frozen: above 0 °C it thaws.
  if (kind === "freezer") return { minC: -60, maxC: 0 };
  // A cold frame follows the weather; its frosts and thaws are the treatment, not an excursion.
  return null;
}

const placeOf = (storeName: string, box: string) => (box && box !== "No box" ? `${storeName}, ${box}` : storeName);

async function loadLastChecks(db: Knex, farmId: string): Promise<Map<string, LastCheckRow>> {
  const latest = db("checks").where({ farm_id: farmId }).whereNull("deleted_at").groupBy("bag_id").select("bag_id").max("checked_at as last");
  const rows: Record<string, unknown>[] = await db("checks as c")
    .join(latest.as("x"), function () {
      this.on("x.bag_id", "=", "c.bag_id").andOn("x.last", "=", "c.checked_at");
    })
    .whereNull("c.deleted_at")
    .select("c.bag_id", "c.checked_at", "c.moisture", "c.mould", "c.sprouts", "c.actions");
  return new Map(rows.map((r) => [String(r.bag_id), parseRow("checks", r) as unknown as LastCheckRow]));
}

/**
 * The farm's round for its `day`, as Today shows it on the phone (lib/domain, effective windows on the farm's
 * clock): the digest's bags to check and the phone reminder's counts. `sources`/`lastChecks` when already read.
 */
export async function loadFarmRound(
  db: Knex,
  farm: { id: string; timezone: string; weekly_check_days: number | null },
  day: string,
  now: Date,
  sources?: BagRowSourcesWithReadings,
  lastChecks?: Map<string, LastCheckRow>,
): Promise<TodaysRound> {
  const s = sources ?? (await loadBagRowSources(db, farm.id, day));
  const checks = lastChecks ?? (await loadLastChecks(db, farm.id));
  // The farm's own history turns bags daily as on Today (same rule, same rows): digest and reminders agree with it.
  const farmWindows = await loadSpeciesWindows(db, farm.id, s, day);
  return buildRoundFromRows(s, checks, day, cadenceFor(farm.weekly_check_days), farmWindowClock(farm.timezone, now), farmWindows);
}

/** What the farm's digest for `day` says; `now` bounds the last day of readings. */
export async function buildFarmDigest(db: Knex, farmId: string, day: string, now: Date): Promise<FarmDigest> {
  const farmRow = await db("farms").where({ id: farmId }).first("id", "name", "timezone", "temperature_unit", "weekly_check_days");
  if (!farmRow) throw new Error(`farm ${farmId} missing`);
  const timezone = isKnownTimeZone(farmRow.timezone) ? farmRow.timezone : "UTC";
  const farm = { id: farmRow.id, name: farmRow.name, timezone, unit: (farmRow.temperature_unit === "F" ? "F" : "C") as TemperatureUnit };

  // The readings also serve the last day's excursions: three days back at least.
  const sources = await loadBagRowSources(db, farmId, addDaysToIsoDay(now.toISOString().slice(0, 10), -3));
  const lastChecks = await loadLastChecks(db, farmId);
  // Windows moved by the cold lost up to now, on the farm's own calendar: the same rows the phone builds.
  const clock = farmWindowClock(timezone, now);
  const rows = buildBagRows(sources, day, clock);
  const species = (r: { species: string; commonName: string }) => (r.commonName ? `${r.species} (${r.commonName})` : r.species);

  const overdue = rows
    .filter((r) => r.state === "overdue" && r.window?.closesOn)
    .map((r) => {
      const late = countDaysBetween(r.window!.closesOn!, day);
      return { code: formatBagCode(r.code), species: species(r), place: placeOf(r.storeName, r.box), note: `${late} day${late === 1 ? "" : "s"} past the latest pull date (${r.window!.closesOn}): pull and sow, or note why it stays.` };
    });
  const opening = rows
    .filter((r) => r.state === "window_open" && r.window?.opensOn === day)
    .map((r) => ({
      code: formatBagCode(r.code),
      species: species(r),
      place: placeOf(r.storeName, r.box),
      note:
        r.window!.closesOn === day
          ? "Opens and closes today: pull and sow today."
          : r.window!.closesOn
            ? `Open until ${r.window!.closesOn}: check daily and pull when the first roots show.`
            : "Check daily and pull when the first roots show.",
    }));
  const listed = new Set(rows.filter((r) => (r.state === "overdue" && r.window?.closesOn) || (r.state === "window_open" && r.window?.opensOn === day)).map((r) => r.id));
  const round = await loadFarmRound(db, { id: farmId, timezone, weekly_check_days: farmRow.weekly_check_days }, day, now, sources, lastChecks);
  const due = round.items
    .filter((i) => !listed.has(i.bag.id))
    .map((i) => ({
      code: formatBagCode(i.bag.code),
      species: i.bag.species ?? "",
      place: placeOf(i.bag.storeName, i.bag.box),
      note: i.isLate ? `${i.next.note} (due since ${i.next.on})` : i.next.note,
    }));

  // Pulled bags waiting to be sown, the same queue as Today's "To sow" group.
  const toSow = buildSowQueueFromRows(sources, lastChecks, day).map((i) => ({
    code: formatBagCode(i.bag.code),
    species: i.bag.species ?? "",
    place: "out of the cold",
    note: i.note,
    late: i.isLate,
  }));

  // Mould found at yesterday's checks (the farm's calendar day).
  const yesterday = addDaysToIsoDay(day, -1);
  const mouldRows: Record<string, unknown>[] = await db("checks as c")
    .join("bags as b", "b.id", "c.bag_id")
    .leftJoin("lots as l", "l.id", "b.lot_id")
    .leftJoin("stores as s", "s.id", "b.store_id")
    .where("c.farm_id", farmId)
    .whereNull("c.deleted_at")
    .whereNull("b.deleted_at")
    .whereIn("c.mould", ["spots", "spreading"])
    .whereBetween("c.checked_at", [addDaysToIsoDay(yesterday, -1), `${addDaysToIsoDay(yesterday, 1)}~`])
    .orderBy("c.checked_at")
    .select("c.checked_at", "c.mould", "c.note", "b.code", "b.box", "l.species", "l.common_name", "s.name as store_name");
  const mouldYesterday = mouldRows
    .filter((r) => findZonedDay(new Date(String(r.checked_at)), timezone) === yesterday)
    .map((r) => ({
      code: formatBagCode(String(r.code)),
      species: r.common_name ? `${r.species} (${r.common_name})` : String(r.species ?? ""),
      place: placeOf(String(r.store_name ?? "No store"), String(r.box ?? "")),
      mould: r.mould as Mould,
      note: (r.note as string | null) ?? null,
    }));

  // Excursions in the last day, from each store's readings, measured by lib/domain.
  const from = new Date(now.getTime() - 86_400_000);
  const excursions: DigestExcursion[] = [];
  for (const store of sources.stores) {
    const band = storeBand(store.kind);
    if (!band) continue;
    const inReach = sources.readings.filter((r) => {
      if (r.store_id !== store.id) return false;
      const t = Date.parse(r.taken_at);
      return t <= now.getTime() && t >= from.getTime() - 2 * 86_400_000;
    });
    if (!inReach.some((r) => Date.parse(r.taken_at) >= from.getTime())) continue;
    const exposure = measureColdExposure(
      inReach.map((r) => ({ at: r.taken_at, value: r.temperature_c, unit: "C" as const })),
      { band, from: from.toISOString(), to: now.toISOString() },
    );
    for (const e of exposure.excursions as Excursion[]) {
      if (Date.parse(e.endAt) < from.getTime() && !e.ongoing) continue;
      excursions.push({ store: store.name, kind: e.kind, from: e.startAt, to: e.endAt, ongoing: e.ongoing, hours: e.hours, peakC: e.peakC, band });
    }
  }

  return { farm, day, due, windowsOpening: opening, overdue, toSow, mouldYesterday, excursions };
}

// ---- The e-mail ----

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

function describeDay(day: string): string {
  return new Date(`${day}T12:00:00Z`).toLocaleDateString("en-GB", { timeZone: "UTC", weekday: "long", day: "numeric", month: "long" });
}

function describeTime(iso: string, zone: string): string {
  return new Date(iso).toLocaleString("en-GB", { timeZone: zone, day: "numeric", month: "short", hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

interface Section {
  title: string;
  intro?: string;
  items: string[];
  caution?: string;
}

function sectionsOf(d: FarmDigest): Section[] {
  const bagLine = (b: DigestBag) => `${b.code} · ${b.species} · ${b.place}: ${b.note}`;
  const t = (c: number) => formatTemperature(c, d.farm.unit);
  const sections: Section[] = [];
  if (d.due.length) sections.push({ title: `Bags to check today (${d.due.length})`, items: d.due.map(bagLine) });
  if (d.windowsOpening.length) sections.push({ title: `Pull windows opening today (${d.windowsOpening.length})`, items: d.windowsOpening.map(bagLine) });
  if (d.overdue.length) sections.push({ title: `Past the latest pull date (${d.overdue.length})`, items: d.overdue.map(bagLine) });
  if (d.toSow.length) {
    const late = d.toSow.filter((b) => b.late).length;
    sections.push({
      title: `Pulled, waiting to be sown (${d.toSow.length}${late ? `, ${late} late` : ""})`,
      items: d.toSow.map((b) => `${b.late ? "LATE · " : ""}${b.code} · ${b.species}: ${b.note}`),
    });
  }
  if (d.mouldYesterday.length) {
    sections.push({
      title: `Mould found yesterday (${d.mouldYesterday.length})`,
      items: d.mouldYesterday.map(
        (m) => `${m.code} · ${m.species} · ${m.place}: ${m.mould === "spreading" ? "mould spreading, discard the bag sealed" : "mould spots, look again today"}${m.note ? ` (“${m.note}”)` : ""}.`,
      ),
      caution: mouldCaution,
    });
  }
  if (d.excursions.length) {
    sections.push({
      title: "Cold stores outside their band in the last day",
      intro: "Bags that were warm or frozen for a while may need a few more days; each store's page shows its bags' effective cold days.",
      items: d.excursions.map((e) => {
        const band = `${t(e.band.minC)} to ${t(e.band.maxC)}`;
        const when = e.ongoing ? `since ${describeTime(e.from, d.farm.timezone)}, still outside at the last reading` : `from ${describeTime(e.from, d.farm.timezone)} to ${describeTime(e.to, d.farm.timezone)}`;
        const dir = e.kind === "above" ? `warmer than ${t(e.band.maxC)}` : `colder than ${t(e.band.minC)}`;
        return `${e.store}: ${dir} ${when}; ${e.kind === "above" ? "warmest" : "coldest"} ${t(e.peakC)} (band ${band}).`;
      }),
    });
  }
  return sections;
}

function subjectOf(d: FarmDigest): string {
  const parts: string[] = [];
  if (d.due.length) parts.push(plural(d.due.length, "bag") + " to check");
  if (d.windowsOpening.length) parts.push(plural(d.windowsOpening.length, "window") + " opening");
  if (d.overdue.length) parts.push(`${d.overdue.length} past the latest pull`);
  if (d.toSow.length) {
    const late = d.toSow.filter((b) => b.late).length;
    parts.push(`${d.toSow.length} to sow${late ? ` (${late} late)` : ""}`);
  }
  if (d.mouldYesterday.length) parts.push("mould found yesterday");
  if (d.excursions.length) parts.push("a cold store left its band");
  return `${d.farm.name} · ${describeDay(d.day)}: ${parts.join(", ")}`;
}

/** The digest as one member's e-mail: plain text and a simple HTML version of the same words. */
export function digestMail(d: FarmDigest, to: { email: string; name: string }): Mail {
  const sections = sectionsOf(d);
  const link = appLink("/today");
  const settings = appLink("/settings");
  const greeting = `Good morning ${to.name},`;
  const opening = `Here is what ${d.farm.name} needs on ${describeDay(d.day)}.`;
  const footer = `You get this because you asked for the daily digest of ${d.farm.name}. Turn it off in Settings: ${settings}`;

  const text = [
    greeting,
    "",
    opening,
    "",
    ...sections.flatMap((s) => [s.title, ...(s.intro ? [s.intro] : []), ...s.items.map((i) => `- ${i}`), ...(s.caution ? [`Caution: ${s.caution}`] : []), ""]),
    `Open today's round: ${link}`,
    "",
    footer,
    "",
    "— Rimebook",
  ].join("\n");

  const p = (s: string, style = "margin:0 0 12px;line-height:1.5") => `<p style="${style}">${escapeHtml(s)}</p>`;
  const html = `<!doctype html><html><body style="margin:0;background:#f4f8fa;font-family:system-ui,-apple-system,Segoe UI,sans-serif;color:#10263a">
<div style="max-width:560px;margin:0 auto;padding:24px 16px">
<div style="font-weight:700;font-size:20px;color:#173a52;margin-bottom:16px">Rimebook</div>
<div style="background:#ffffff;border:1px solid #cddde5;border-radius:16px;padding:20px">
${p(greeting)}
${p(opening)}
${sections
  .map(
    (s) => `<h2 style="font-size:16px;margin:18px 0 8px;color:#173a52">${escapeHtml(s.title)}</h2>
${s.intro ? p(s.intro, "margin:0 0 8px;line-height:1.5;color:#3d5364") : ""}<ul style="margin:0 0 8px;padding-left:20px;line-height:1.5">${s.items.map((i) => `<li>${escapeHtml(i)}</li>`).join("")}</ul>
${s.caution ? p(`Caution: ${s.caution}`, "margin:0 0 8px;padding:8px 12px;border-radius:10px;background:#fff4e5;line-height:1.5") : ""}`,
  )
  .join("\n")}
<p style="margin:20px 0 0"><a href="${escapeHtml(link)}" style="display:inline-block;background:#1f4d6c;color:#ffffff;text-decoration:none;font-weight:600;padding:12px 20px;border-radius:12px">Open today's round</a></p>
</div>
${p(footer, "font-size:13px;color:#3d5364;line-height:1.5;margin:12px 4px 0")}
</div></body></html>`;
  return { to: to.email, subject: subjectOf(d), text, html };
}

// ---- Running it ----

export type DigestOutcome = {
  farmId: string;
  day: string;
  /** sent · already_sent (earlier run today) · nothing_due · no_recipients · failed (mail server unreachable; a later run retries) */
  status: "sent" | "already_sent" | "nothing_due" | "no_recipients" | "failed";
  recipients: number;
  failed: number;
};

/** The farm's calendar day at `now`, in its own time zone. */
export async function findFarmDay(db: Knex, farmId: string, now: Date): Promise<string> {
  const farm = await db("farms").where({ id: farmId }).first("timezone");
  return findZonedDay(now, farm && isKnownTimeZone(farm.timezone) ? farm.timezone : "UTC");
}


/**
 * Sends the farm's digest for its day at `now`, once: the digest_runs row is claimed before any mail
 * goes out, so two runs at once (cron and a person) cannot both send. When no mail at all could be
 * sent, the claim is released so a later run tries again.
 */
export async function runFarmDigest(db: Knex, farmId: string, now = new Date()): Promise<DigestOutcome> {
  const day = await findFarmDay(db, farmId, now);
  const outcome = (status: DigestOutcome["status"], recipients = 0, failed = 0): DigestOutcome => ({ farmId, day, status, recipients, failed });
  try {
    await db("digest_runs").insert({ farm_id: farmId, day, sent_at: now.toISOString(), recipients: 0 });
  } catch (err) {
    if (isUniqueViolation(err)) return outcome("already_sent");
    throw err;
  }
  try {
    const members: { email: string; name: string }[] = await db("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where({ "m.farm_id": farmId, "m.digest_opt_in": true })
      .whereNull("m.deleted_at")
      .whereNull("u.deleted_at")
      .orderBy("u.email")
      .select("u.email", "u.name");
    if (members.length === 0) return outcome("no_recipients");
    const digest = await buildFarmDigest(db, farmId, day, now);
    if (isEmptyDigest(digest)) return outcome("nothing_due");
    let sent = 0;
    for (const m of members) if (await sendMail(digestMail(digest, m))) sent++;
    if (sent === 0) {
      await db("digest_runs").where({ farm_id: farmId, day }).delete();
      return outcome("failed", 0, members.length);
    }
    await db("digest_runs").where({ farm_id: farmId, day }).update({ recipients: sent, sent_at: new Date().toISOString() });
    return outcome("sent", sent, members.length - sent);
  } catch (err) {
    // Something broke before any mail went out: release the claim so the next run tries again.
    await db("digest_runs").where({ farm_id: farmId, day, recipients: 0 }).delete();
    throw err;
  }
}

/** Every live farm's digest for its own today. One farm failing does not stop the others. */
export async function runDigestForAllFarms(db: Knex, now = new Date()): Promise<DigestOutcome[]> {
  const farms: { id: string }[] = await db("farms").whereNull("deleted_at").orderBy("created_at").select("id");
  const outcomes: DigestOutcome[] = [];
  for (const f of farms) {
    try {
      outcomes.push(await runFarmDigest(db, f.id, now));
    } catch (err) {
      console.error(`[rimebook] digest for farm ${f.id} failed: ${(err as Error).message}`);
      outcomes.push({ farmId: f.id, day: await findFarmDay(db, f.id, now), status: "failed", recipients: 0, failed: 0 });
    }
  }
  return outcomes;
}
