import { addDaysToIsoDay, countDaysBetween, type IsoDay } from "@/lib/domain/dates";

// Geometry of the bag's window bar: start → window opens → window closes, with a marker for today.
// Everything is a percentage of the bar's width so the SVG/CSS can scale to any screen.

export interface WindowBarInput {
  startedOn: IsoDay;
  opensOn: IsoDay;
  /** Null: no latest date (pull when roots show); the window fades out at the bar's end. */
  closesOn: IsoDay | null;
  today: IsoDay;
  /** The window moved later by lost cold days, drawn as a second, dashed window. */
  shifted?: { opensOn: IsoDay; closesOn: IsoDay | null } | null;
}

export interface WindowBarSpan {
  fromPct: number;
  toPct: number;
}

export interface WindowBarGeometry {
  /** Day at the bar's right edge. */
  endsOn: IsoDay;
  totalDays: number;
  chill: WindowBarSpan;
  window: WindowBarSpan & { openEnded: boolean };
  shifted: (WindowBarSpan & { openEnded: boolean }) | null;
  /** Where today falls: before the start, chilling, inside the window, or past its latest date. */
  today: { pct: number; phase: "before_start" | "chilling" | "in_window" | "past_window"; dayNumber: number };
}

/** Days drawn after an open-ended window opens, and the least run-out after the last date shown. */
const openEndedTailDays = 14;

function clampPct(x: number): number {
  return Math.min(100, Math.max(0, x));
}

/** Rounded to 0.1 % so snapshots and tests stay readable. */
function round1(x: number): number {
  return Math.round(x * 10) / 10;
}

export function computeWindowBarGeometry(input: WindowBarInput): WindowBarGeometry {
  const { startedOn, opensOn, closesOn, today, shifted } = input;
  const candidates: IsoDay[] = [closesOn ?? addDaysToIsoDay(opensOn, openEndedTailDays)];
  if (shifted) candidates.push(shifted.closesOn ?? addDaysToIsoDay(shifted.opensOn, openEndedTailDays));
  if (today > startedOn) candidates.push(today);
  let endsOn = candidates.reduce((a, b) => (b > a ? b : a));
  // A window that closes on the day it opens still needs a visible sliver.
  if (countDaysBetween(startedOn, endsOn) < 1) endsOn = addDaysToIsoDay(startedOn, 1);
  const totalDays = countDaysBetween(startedOn, endsOn);
  const pct = (day: IsoDay) => round1(clampPct((countDaysBetween(startedOn, day) / totalDays) * 100));

  const span = (o: IsoDay, c: IsoDay | null) => ({ fromPct: pct(o), toPct: c === null ? 100 : Math.max(pct(c), pct(o)), openEnded: c === null });
  const dayNumber = countDaysBetween(startedOn, today);
  return {
    endsOn,
    totalDays,
    chill: { fromPct: 0, toPct: pct(opensOn) },
    window: span(opensOn, closesOn),
    shifted: shifted ? span(shifted.opensOn, shifted.closesOn) : null,
    today: {
      pct: pct(today),
      phase:
        today < startedOn
          ? "before_start"
          : today < opensOn
            ? "chilling"
            : closesOn === null || today <= closesOn
              ? "in_window"
              : "past_window",
      dayNumber,
    },
  };
}
