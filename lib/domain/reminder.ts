import type { ReminderMessage } from "@/lib/schemas/reminder";
import { formatBagCode } from "./bag-codes";
import type { TodaysRound } from "./round";
import { chipKindOf, countStoreBags, roundChipLabels, type RoundChipKind } from "./rows/round-input";

// The phone reminder: when a person's chosen hour has come on the farm's clock, and what the message says.
// Built from the same round Today shows (lib/domain/round.ts), so the phone and the reminder never disagree.
// The message carries only counts, store names and bag codes: it crosses a push service we do not run.

export type ReminderTimeOfDay = { hour: number; days: readonly number[] };
export type FarmClock = { day: string; hour: number; weekday: number };

/**
 * A scheduler that runs every hour may be late or skip a run: the reminder still goes out up to this many hours
 * after the chosen hour, the same day, and never later (a 7 o'clock nudge at tea time helps nobody).
 */
export const REMINDER_LATE_HOURS = 2;

/** True when, at `clock` (the farm's wall clock), the person's reminder for today is due. */
export function isReminderDue(time: ReminderTimeOfDay, clock: FarmClock): boolean {
  if (!time.days.includes(clock.weekday)) return false;
  return clock.hour >= time.hour && clock.hour <= time.hour + REMINDER_LATE_HOURS;
}

/** The most urgent kinds, in the order the message names them (Today's chip words). */
const urgentKinds: readonly RoundChipKind[] = ["discard_now", "mould_follow_up", "pull_now", "overdue"];
const CODES_PER_KIND = 4;
const STORES_LISTED = 4;

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function listWithMore(items: string[], shown: number, sep = ", "): string {
  return items.length > shown ? `${items.slice(0, shown).join(sep)} +${items.length - shown} more` : items.join(sep);
}

/**
 * The reminder for today's round, or null when nothing is due (then nothing is sent). `farmName` is added only
 * for people on more than one farm, so they know which farm's fridges are meant.
 */
export function composeReminder(round: TodaysRound, opts: { farmName?: string | null } = {}): ReminderMessage | null {
  const due = round.items.length;
  if (due === 0) return null;
  const title = `${plural(due, "bag")} to check today${opts.farmName ? ` · ${opts.farmName}` : ""}`;
  const stores = round.stores.map((s) => `${s.storeName} ${countStoreBags(s)}`);
  const lines = [listWithMore(stores, STORES_LISTED, " · ")];
  for (const kind of urgentKinds) {
    const codes = round.items.filter((i) => chipKindOf(i) === kind).map((i) => formatBagCode(i.bag.code));
    if (codes.length) lines.push(`${roundChipLabels[kind]}: ${listWithMore(codes, CODES_PER_KIND)}`);
  }
  return { title, body: lines.join("\n"), url: "/today", tag: "rimebook-round" };
}

/** The test reminder's words: proves the set-up end to end, with today's count so it is not empty news. */
export function composeTestReminder(round: TodaysRound): ReminderMessage {
  const real = composeReminder(round);
  return {
    title: "Rimebook reminders work on this phone",
    body: real ? `Today: ${real.title.toLowerCase()}.\n${real.body}` : "Nothing is due today. Your reminder comes at the hour you chose when bags are due.",
    url: "/today",
    tag: "rimebook-test",
  };
}

const weekdayShort = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

/** "every day", "Mon–Fri", "Mon, Wed, Fri": the days in words for Settings. */
export function describeReminderDays(days: readonly number[]): string {
  const d = [...new Set(days)].sort();
  if (d.length === 7) return "every day";
  if (d.length === 5 && d.join("") === "12345") return "Mon–Fri";
  if (d.length === 2 && d.join("") === "67") return "weekends";
  return d.map((n) => weekdayShort[n - 1]).join(", ");
}

export const reminderWeekdays = weekdayShort.map((label, i) => ({ day: i + 1, label }));

/** "07:00" */
export const formatHour = (hour: number) => `${String(hour).padStart(2, "0")}:00`;
