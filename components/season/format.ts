import { parseIsoDay, type IsoDay } from "@/lib/domain/dates";

const day = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short" });
const dayYear = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });
const stamp = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" });

/** "12 Mar" (with the year when it is not this year's). */
export function formatDay(d: IsoDay, thisYear = new Date().getFullYear()): string {
  const date = parseIsoDay(d);
  return (date.getFullYear() === thisYear ? day : dayYear).format(date);
}

/** "12 Mar, 08:30" in this phone's time. */
export function formatStamp(at: string): string {
  const d = new Date(at);
  return Number.isNaN(d.getTime()) ? at : stamp.format(d);
}
