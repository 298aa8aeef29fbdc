import type { Count } from "@/lib/schemas/count";
import { parseIsoDay, type IsoDay } from "./dates";

// The running total of a sowing's germination counts: one rule for the phone's stepper and the server's check of
// pushed counts (an offline phone may not have seen another phone's counts).

export type CountRowForTotals = Pick<Count, "counted_on" | "germinated_total" | "created_at"> & { deleted_at?: string | null };

export interface DailyTotal {
  countedOn: IsoDay;
  total: number;
}

/**
 * One running total per day. Counts are append-only, so a recount on the same day is a new row:
 * the latest entered row of that day stands.
 */
export function pickDailyTotals(counts: readonly CountRowForTotals[]): DailyTotal[] {
  const byDay = new Map<string, CountRowForTotals>();
  for (const c of counts) {
    if (c.deleted_at) continue;
    const seen = byDay.get(c.counted_on);
    if (!seen || c.created_at >= seen.created_at) byDay.set(c.counted_on, c);
  }
  return [...byDay.values()]
    .sort((a, b) => (a.counted_on < b.counted_on ? -1 : a.counted_on > b.counted_on ? 1 : 0))
    .map((c) => ({ countedOn: c.counted_on, total: c.germinated_total }));
}

const longDay = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });
/** "8 Nov 2026": how a day is written in a refusal when the screen does not say otherwise. */
const formatCountDay = (day: IsoDay) => longDay.format(parseIsoDay(day));

export type CountVerdict = { ok: true } | { ok: false; message: string };

/**
 * Rules for saving a running total on a day: a whole number, not below an earlier day's total nor above a later
 * day's, not more than were sown, and only on a day after sowing and
 * not in the future. Common practice for cumulative germination counts (each count includes every seedling so far).
 */
export function judgeCountEntry(input: {
  sownOn: IsoDay;
  seedsSown: number;
  /** The counter's today; left out on the server, which cannot know the phone's calendar day. */
  today?: IsoDay;
  countedOn: IsoDay;
  total: number;
  totals: readonly DailyTotal[];
  /** How days are written in the messages (the screen passes "27 Nov"). */
  formatDay?: (day: IsoDay) => string;
}): CountVerdict {
  const { sownOn, seedsSown, today, countedOn, total, totals } = input;
  const day = input.formatDay ?? formatCountDay;
  if (!Number.isInteger(total) || total < 0) return { ok: false, message: "A count is a whole number, zero or more." };
  if (countedOn <= sownOn) return { ok: false, message: `Counts start the day after sowing (sown ${day(sownOn)}).` };
  if (today !== undefined && countedOn > today) return { ok: false, message: "That day has not come yet; count on the day itself." };
  if (total > seedsSown) return { ok: false, message: `Only ${seedsSown} seeds were sown, so at most ${seedsSown} can be up.` };
  const before = [...totals].reverse().find((t) => t.countedOn < countedOn);
  if (before && total < before.total) {
    return {
      ok: false,
      message: `${before.total} were already up on ${day(before.countedOn)}. The count is a running total, so it cannot go below that; count every seedling up so far, including earlier ones.`,
    };
  }
  const after = totals.find((t) => t.countedOn > countedOn);
  if (after && total > after.total) {
    return { ok: false, message: `A later count (${day(after.countedOn)}) had only ${after.total}; a running total on an earlier day cannot be higher.` };
  }
  return { ok: true };
}

