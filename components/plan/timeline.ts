import { addDaysToIsoDay, countDaysBetween, parseIsoDay, type IsoDay } from "@/lib/domain/dates";
import type { PhaseKind } from "@/lib/schemas/vocabulary";
import type { PhaseStartBy } from "@/lib/domain";

// Geometry of the season timeline: one row per plan row, its phases as bars that end at the sowing date,
// a lighter lead-in where the bag may start earlier, month ticks and a today line. Percentages of the width.

export interface TimelineRowInput {
  id: string;
  label: string;
  sowOn: IsoDay;
  phases: readonly PhaseStartBy[];
}

export interface TimelineBar {
  kind: PhaseKind;
  left: number;
  width: number;
  from: IsoDay;
  to: IsoDay;
}

export interface TimelineRow {
  id: string;
  label: string;
  bars: TimelineBar[];
  /** Earliest sensible start to the latest start of the first phase, when sources allow a range. */
  leadIn: { left: number; width: number } | null;
  sow: number;
  sowOn: IsoDay;
}

export interface Timeline {
  from: IsoDay;
  to: IsoDay;
  rows: TimelineRow[];
  months: { left: number; label: string }[];
  today: number | null;
}

const monthLabel = new Intl.DateTimeFormat("en-GB", { month: "short" });

export function layOutTimeline(rows: readonly TimelineRowInput[], today: IsoDay, marginDays = 7): Timeline | null {
  if (rows.length === 0) return null;
  const days = rows.flatMap((r) => [r.sowOn, ...r.phases.flatMap((p) => [p.startBy, ...(p.startFrom ? [p.startFrom] : [])])]);
  const min = days.reduce((a, b) => (b < a ? b : a));
  const max = days.reduce((a, b) => (b > a ? b : a));
  const from = addDaysToIsoDay(min, -marginDays);
  const to = addDaysToIsoDay(max, marginDays);
  const span = Math.max(1, countDaysBetween(from, to));
  const at = (d: IsoDay) => (100 * countDaysBetween(from, d)) / span;

  const laid = rows.map((r): TimelineRow => {
    const bars = r.phases.map((p, i) => {
      const end = i + 1 < r.phases.length ? r.phases[i + 1].startBy : r.sowOn;
      return { kind: p.kind, left: at(p.startBy), width: at(end) - at(p.startBy), from: p.startBy, to: end };
    });
    const first = r.phases[0];
    const leadIn = first?.startFrom && first.startFrom < first.startBy ? { left: at(first.startFrom), width: at(first.startBy) - at(first.startFrom) } : null;
    return { id: r.id, label: r.label, bars, leadIn, sow: at(r.sowOn), sowOn: r.sowOn };
  });

  const months: Timeline["months"] = [];
  const start = parseIsoDay(from);
  for (let y = start.getFullYear(), m = start.getMonth() + 1; ; m++) {
    if (m > 11) {
      m = 0;
      y++;
    }
    const first = `${y}-${String(m + 1).padStart(2, "0")}-01`;
    if (first > to) break;
    months.push({ left: at(first), label: monthLabel.format(parseIsoDay(first)) });
  }
  return { from, to, rows: laid, months, today: today >= from && today <= to ? at(today) : null };
}
