import { addDaysToIsoDay, countDaysBetween, formatDayInWords, parseIsoDay, type IsoDay } from "@/lib/domain/dates";
import type { PhaseKind } from "@/lib/schemas/words";
import type { PhaseStartBy } from "@/lib/domain/planning";

// The season counted back from the grower's fixed point: the farm's last frost (or, without one, each species'
// own sowing day). Pure: dates in, days-before-frost, cold still needed from today and grower words out; the
// picture (SeasonTimeline.tsx) only places what this returns.

export interface SeasonLaneInput {
  id: string;
  label: string;
  sowOn: IsoDay;
  phases: readonly PhaseStartBy[];
  /** The bag started for this row, if any: the day it went in (null while only planned) and the day it came out. */
  bag?: { startedOn: IsoDay | null; outOn: IsoDay | null } | null;
}

export type LaneStatus = "no_cold" | "waiting" | "due" | "late" | "in_bag" | "done";

export interface LaneSegment {
  kind: PhaseKind;
  cold: boolean;
  from: IsoDay;
  days: number;
  /** Days before the anchor (frost or sowing) at which the segment starts and ends; negative = after it. */
  startsBefore: number;
  endsBefore: number;
}

export interface SeasonLane {
  id: string;
  label: string;
  sowOn: IsoDay;
  status: LaneStatus;
  /** Day the first phase must start (the bag goes in), null when nothing needs time. */
  startBy: IsoDay | null;
  segments: LaneSegment[];
  /** Earliest sensible start, in days before the anchor, where sources give a range. */
  leadInBefore: number | null;
  sowBefore: number;
  /** Today in days before this lane's anchor (negative once the anchor is past). */
  todayBefore: number;
  /** Days of cold (cold-moist and frozen phases) the seed needs in all, has had by today, and still needs. */
  coldNeeded: number;
  coldDone: number;
  coldToGo: number;
  /** Days of the whole pretreatment the bag has behind it by today (for drawing what is done). */
  doneDays: number;
  /** "not started — must go in by Thu 8 Jan, 3 weeks from now", "late: should have started Fri 6 Mar, …". */
  headline: string;
  /** "needs 90 days cold · 62 to go". */
  coldLine: string;
  /** "13 weeks before frost" for the start-by day; null without a start-by. */
  startByBefore: string | null;
  /** The gauge in one sentence for a screen reader (the tag's words are read as they are): phases in order, then sowing. */
  spoken: string;
}

export interface SeasonCountdown {
  anchorKind: "frost" | "sowing";
  /** The farm's frost day for the season; null when each lane counts back from its own sowing day. */
  frostOn: IsoDay | null;
  /** The scale runs from `before` days before the anchor to `after` days after it (both whole weeks). */
  before: number;
  after: number;
  ticks: { before: number; label: string }[];
  /** Where today sits on the shared scale (frost anchor only, and only inside the scale). */
  todayBefore: number | null;
  lanes: SeasonLane[];
}

const weekdays = ["Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"];
const COLD_KINDS: ReadonlySet<PhaseKind> = new Set<PhaseKind>(["cold_moist", "frozen"]);
const phaseWords: Record<PhaseKind, string> = { warm_moist: "warm", cold_moist: "cold", frozen: "frozen", scarify: "scarified", light: "in light" };

/** "2027-01-08" → "Fri 8 Jan"; the year is added only for a day more than half a year from `today` (or with no today). */
export function formatDayWithWeekday(day: IsoDay, today?: IsoDay): string {
  const withYear = !today || Math.abs(countDaysBetween(today, day)) > 183;
  const words = formatDayInWords(day); // "8 Jan 2027", the way every sentence writes a day
  return `${weekdays[parseIsoDay(day).getDay()]} ${withYear ? words : words.replace(/ \d{4}$/, "")}`;
}

/** Whole days from today to a day, in words: "today", "tomorrow", "in 5 days", "3 weeks from now", "12 days ago". */
export function describeDaysAway(days: number): string {
  if (days === 0) return "today";
  if (days === 1) return "tomorrow";
  if (days === -1) return "yesterday";
  const n = Math.abs(days);
  return days > 0 ? (n < 14 ? `in ${describeSpan(n)}` : `${describeSpan(n)} from now`) : `${describeSpan(n)} ago`;
}

/** A length of time in words: "1 day", "12 days", "3 weeks" (whole weeks, rounded down, from 14 days on). */
export function describeSpan(days: number): string {
  if (days < 14) return `${days} day${days === 1 ? "" : "s"}`;
  return `${Math.floor(days / 7)} weeks`;
}

/** Days before the anchor in words: "12 weeks before frost", "about 13 weeks before frost", "at frost", "2 weeks after frost". */
export function describeWeeksBefore(daysBefore: number, anchor: "frost" | "sowing" = "frost"): string {
  const what = anchor === "frost" ? "frost" : "sowing";
  if (daysBefore === 0) return `at ${what}`;
  const n = Math.abs(daysBefore);
  const side = daysBefore > 0 ? "before" : "after";
  if (n < 7) return `${n} day${n === 1 ? "" : "s"} ${side} ${what}`;
  const weeks = Math.round(n / 7);
  return `${n % 7 === 0 ? "" : "about "}${weeks} week${weeks === 1 ? "" : "s"} ${side} ${what}`;
}

/** Days of [from, to) that fall inside [a, b) — overlap of two spans counted in days. */
const overlap = (from: number, to: number, a: number, b: number) => Math.max(0, Math.min(to, b) - Math.max(from, a));

/** One species counted back from its anchor, with what is done and what is left as of today. */
export function countDownLane(input: SeasonLaneInput, anchor: IsoDay, anchorKind: "frost" | "sowing", today: IsoDay): SeasonLane {
  const before = (d: IsoDay) => countDaysBetween(d, anchor);
  const words = (d: IsoDay) => formatDayWithWeekday(d, today);
  const first = input.phases[0] ?? null;
  const startBy = first?.startBy ?? null;
  const started = input.bag?.startedOn && input.bag.startedOn <= today && startBy ? input.bag.startedOn : null;
  // A started bag is drawn where it really is: its phases run from the day it went in (late bags end past sowing).
  const shift = started ? countDaysBetween(startBy!, started) : 0;
  const segments: LaneSegment[] = input.phases.map((p, i) => {
    const end = i + 1 < input.phases.length ? input.phases[i + 1].startBy : input.sowOn;
    const from = addDaysToIsoDay(p.startBy, shift);
    const to = addDaysToIsoDay(end, shift);
    return { kind: p.kind, cold: COLD_KINDS.has(p.kind), from, days: countDaysBetween(p.startBy, end), startsBefore: before(from), endsBefore: before(to) };
  });
  const coldNeeded = segments.filter((s) => s.cold).reduce((a, s) => a + s.days, 0);
  const totalDays = segments.reduce((a, s) => a + s.days, 0);
  const leadInBefore = !started && first?.startFrom && first.startFrom < first.startBy ? before(first.startFrom) : null;

  // Days the bag has been through its phases (in the planned order and lengths) by today, or until it came out.
  let doneDays = 0;
  let coldDone = 0;
  if (started) {
    const until = input.bag?.outOn && input.bag.outOn < today ? input.bag.outOn : today;
    doneDays = Math.min(totalDays, Math.max(0, countDaysBetween(started, until)));
    let at = 0;
    for (const s of segments) {
      if (s.cold) coldDone += overlap(0, doneDays, at, at + s.days);
      at += s.days;
    }
  }
  const out = Boolean(started && input.bag?.outOn && input.bag.outOn <= today);
  const coldToGo = out ? 0 : coldNeeded - coldDone;

  let status: LaneStatus;
  let headline: string;
  if (segments.length === 0 || totalDays === 0) {
    status = "no_cold";
    headline = `no cold needed — sow ${words(input.sowOn)}`;
  } else if (out) {
    status = "done";
    headline = `done — out of the cold ${words(input.bag!.outOn!)}`;
  } else if (started) {
    status = "in_bag";
    const late = countDaysBetween(startBy!, started);
    const ready = addDaysToIsoDay(started, totalDays);
    headline = `${segments[0].cold ? "in the cold" : "in the bag"} since ${words(started)}${late > 0 ? ` (${late} day${late === 1 ? "" : "s"} after the start-by day)` : ""} — ready ${ready <= today ? "now" : words(ready)}`;
  } else {
    const away = countDaysBetween(today, startBy!);
    if (away < 0) {
      status = "late";
      const ready = addDaysToIsoDay(today, totalDays);
      headline = `late: should have started ${words(startBy!)} — starting today, ready ${words(ready)}, ${describeSpan(countDaysBetween(input.sowOn, ready))} after sowing`;
    } else {
      status = away <= 14 ? "due" : "waiting";
      const from = first?.startFrom && first.startFrom < first.startBy ? first.startFrom : null;
      const opens = from && from > today ? `; can go in from ${words(from)}` : from ? "; can go in now" : "";
      headline = `not started — must go in by ${words(startBy!)}, ${describeDaysAway(away)}${opens}`;
    }
  }

  const warm = segments.filter((s) => !s.cold && s.days > 0);
  const need = [...warm.map((s) => `${s.days} days ${phaseWords[s.kind]}`), ...(coldNeeded > 0 ? [`${coldNeeded} days cold`] : [])].join(", then ");
  const coldLine =
    status === "no_cold"
      ? "no pretreatment"
      : coldNeeded === 0
        ? `needs ${need}`
        : `needs ${need} · ${coldToGo === 0 ? "cold done" : `${coldToGo} to go`}`;
  const spokenPhases = segments.map((s) => `${s.days} days ${phaseWords[s.kind]} from ${words(s.from)}`).join(", then ");
  const sowWords = `sow ${words(input.sowOn)}, ${describeWeeksBefore(before(input.sowOn), anchorKind)}`;
  return {
    id: input.id,
    label: input.label,
    sowOn: input.sowOn,
    status,
    startBy,
    segments,
    leadInBefore,
    sowBefore: before(input.sowOn),
    todayBefore: before(today),
    coldNeeded,
    coldDone: Math.min(coldDone, coldNeeded),
    coldToGo,
    doneDays,
    headline,
    coldLine,
    startByBefore: startBy ? describeWeeksBefore(before(startBy), anchorKind) : null,
    spoken: `${spokenPhases ? `${spokenPhases[0].toUpperCase()}${spokenPhases.slice(1)}; ` : ""}${sowWords}.`,
  };
}

/**
 * The whole season on one scale of weeks before the anchor: the farm's frost day when known, else each lane's own
 * sowing day. Lanes keep the order given. Null when there is nothing to draw.
 */
export function countDownSeason(rows: readonly SeasonLaneInput[], frostOn: IsoDay | null, today: IsoDay): SeasonCountdown | null {
  if (rows.length === 0) return null;
  const anchorKind = frostOn ? "frost" : "sowing";
  const lanes = rows.map((r) => countDownLane(r, frostOn ?? r.sowOn, anchorKind, today));
  const earliest = Math.max(0, ...lanes.map((l) => Math.max(l.leadInBefore ?? 0, ...l.segments.map((s) => s.startsBefore), l.sowBefore)));
  // A bag started late runs past its sowing day, maybe past the frost: the scale reaches its end too.
  const latest = Math.max(0, ...lanes.map((l) => Math.max(-l.sowBefore, ...l.segments.map((s) => -s.endsBefore))));
  const step = earliest > 40 * 7 ? 8 : earliest > 12 * 7 ? 4 : 2; // weeks between labelled ticks: a handful on a phone
  const before = Math.max(step, Math.ceil(earliest / 7 / step) * step) * 7;
  const after = Math.ceil(latest / 7) * 7;
  const ticks: SeasonCountdown["ticks"] = [];
  for (let w = before / 7; w > 0; w -= step) ticks.push({ before: w * 7, label: `${w} wk` });
  ticks.push({ before: 0, label: anchorKind === "frost" ? "frost" : "sow" });
  const todayBefore = frostOn ? countDaysBetween(today, frostOn) : null;
  return {
    anchorKind,
    frostOn,
    before,
    after,
    ticks,
    todayBefore: todayBefore !== null && todayBefore <= before && todayBefore >= -after ? todayBefore : null,
    lanes,
  };
}

/** Left edge, in percent of the scale's width, of a point `daysBefore` the anchor. */
export function placeOnScale(scale: Pick<SeasonCountdown, "before" | "after">, daysBefore: number): number {
  return (100 * (scale.before - daysBefore)) / Math.max(1, scale.before + scale.after);
}
