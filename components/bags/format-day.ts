import { parseIsoDay, type IsoDay } from "@/lib/domain/dates";

const short = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short" });
const long = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });
const stamp = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit" });

/** "12 Mar" */
export function formatShortDay(day: IsoDay): string {
  return short.format(parseIsoDay(day));
}

/** "12 Mar 2026" */
export function formatLongDay(day: IsoDay): string {
  return long.format(parseIsoDay(day));
}

/** "12 Mar 2026, 08:30" in the phone's own time zone. */
export function formatStamp(at: string): string {
  const d = new Date(at);
  return Number.isNaN(d.getTime()) ? at : stamp.format(d);
}
