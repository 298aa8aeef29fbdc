"use client";

import { useEffect, useState } from "react";
import type { Sowing } from "@/lib/schemas/sowing";
import { recordCount } from "@/lib/client/repo";
import { Button } from "@/components/ui/Button";
import { Field, Input } from "@/components/ui/Field";
import { describeSaveError } from "@/components/bags/save-error";
import { formatShortDay as formatDay } from "@/components/bags/format-day";
import { judgeCountEntry, type DailyTotal } from "@/lib/domain/count-rules";
import { findStartingTotal, stepTotal } from "./count-series";
import { Notice } from "@/components/season/Notice";

/** Big −/+ steppers for the running total of seedlings up on a day; saves on the phone (works with no signal). */
export function CountStepper({ sowing, totals, today, canCount }: { sowing: Sowing; totals: DailyTotal[]; today: string; canCount: boolean }) {
  const firstDay = totals.length ? totals[totals.length - 1].countedOn : today;
  const [day, setDay] = useState(today > sowing.sown_on ? today : firstDay);
  const saved = findStartingTotal(totals, day);
  const [value, setValue] = useState(saved);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  // A new day, or a count synced in from another phone, resets the stepper to what is saved.
  useEffect(() => setValue(saved), [saved, day]);

  const verdict = judgeCountEntry({ sownOn: sowing.sown_on, seedsSown: sowing.seeds_sown, today, countedOn: day, total: value, totals, formatDay });
  const savedToday = totals.some((t) => t.countedOn === day);
  const changed = value !== saved || !savedToday;

  async function save() {
    if (!verdict.ok) return;
    setBusy(true);
    setMessage(null);
    try {
      await recordCount({ sowing_id: sowing.id, counted_on: day, germinated_total: value, note: null });
      setMessage({ ok: true, text: `Saved: ${value} up on ${formatDay(day)}.` });
    } catch (e) {
      setMessage({ ok: false, text: describeSaveError(e) });
    } finally {
      setBusy(false);
    }
  }

  if (!canCount) return <p className="text-label text-ink-soft">Helpers and up record counts.</p>;
  const step = (d: number) => {
    setMessage(null);
    setValue((v) => stepTotal(v, d, sowing.seeds_sown));
  };
  const inputId = `count-${sowing.id}`;
  return (
    <div className="space-y-3">
      <Field label="Day counted" htmlFor={`${inputId}-day`}>
        <Input id={`${inputId}-day`} type="date" value={day} min={sowing.sown_on} max={today} onChange={(e) => e.target.value && setDay(e.target.value)} />
      </Field>
      <div>
        <label htmlFor={inputId} className="block text-label font-semibold text-ink">
          Seedlings up so far (running total, of {sowing.seeds_sown} sown)
        </label>
        <div className="mt-1 flex items-stretch gap-2">
          <Button tone="quiet" size="xl" aria-label="One fewer" className="w-20" onClick={() => step(-1)} disabled={value <= 0}>
            <span className="text-display leading-none" aria-hidden="true">−</span>
          </Button>
          <input
            id={inputId}
            inputMode="numeric"
            pattern="[0-9]*"
            value={String(value)}
            onChange={(e) => {
              const n = Number(e.target.value.replace(/\D/g, "") || "0");
              setMessage(null);
              setValue(Math.min(n, 10_000_000));
            }}
            className="min-h-20 w-full min-w-0 flex-1 rounded-card border-2 border-rime-300 bg-paper text-center text-display font-bold text-ink focus:border-glacier-500"
            aria-describedby={`${inputId}-why`}
            aria-invalid={!verdict.ok}
          />
          <Button tone="quiet" size="xl" aria-label="One more" className="w-20" onClick={() => step(1)} disabled={value >= sowing.seeds_sown}>
            <span className="text-display leading-none" aria-hidden="true">+</span>
          </Button>
        </div>
        <div className="mt-2 flex gap-2">
          {[5, 10].map((n) => (
            <Button key={n} tone="quiet" className="flex-1" onClick={() => step(n)}>
              +{n}
            </Button>
          ))}
        </div>
        <p id={`${inputId}-why`} role={verdict.ok ? undefined : "alert"} className={`mt-2 text-label ${verdict.ok ? "text-ink-soft" : "font-medium text-ember-700"}`}>
          {verdict.ok ? (savedToday ? `Saved for ${formatDay(day)}: ${saved}.` : `Nothing saved for ${formatDay(day)} yet.`) : verdict.message}
        </p>
      </div>
      <Button size="lg" tone="good" className="w-full" disabled={!verdict.ok || !changed || busy} onClick={() => void save()}>
        Save {value} up on {formatDay(day)}
      </Button>
      {message ? <Notice ok={message.ok}>{message.text}</Notice> : null}
    </div>
  );
}
