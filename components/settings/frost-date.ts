// The farm's average last spring frost is a month and day ("05-10"), the same every year.

export const monthNames = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"] as const;

/** Days in a month of a leap year, so 29 February can be chosen (the plan then says when a year has none). */
export function countDaysInMonth(month: number): number {
  return new Date(2024, month, 0).getDate();
}

export function splitMonthDay(md: string | null | undefined): { month: number; day: number } | null {
  const m = /^(\d{2})-(\d{2})$/.exec(md ?? "");
  return m ? { month: Number(m[1]), day: Number(m[2]) } : null;
}

/** Month 1–12 and day → "MM-dd", the day kept inside the month. */
export function joinMonthDay(month: number, day: number): string {
  const d = Math.min(day, countDaysInMonth(month));
  return `${String(month).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
}

/** "10 May" */
export function describeMonthDay(md: string | null | undefined): string | null {
  const p = splitMonthDay(md);
  return p ? `${p.day} ${monthNames[p.month - 1]}` : null;
}
