"use client";

import { useEffect, useState } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Chip } from "@/components/ui/Chip";
import { Field, Select } from "@/components/ui/Field";
import { Notice } from "@/components/season/Notice";
import { describeReminderDays, formatHour, reminderWeekdays } from "@/lib/domain/reminder";
import { everyDay, type ReminderState, type ReminderTime } from "@/lib/schemas/reminder";
import { checkThisPhone, loadReminderState, readPushSupport, remindMeOnThisPhone, saveReminderTime, sendTestReminder, stopRemindersOnThisPhone } from "@/lib/client/reminders";

const hours = Array.from({ length: 24 }, (_, h) => h);
const sameTime = (a: ReminderTime, b: ReminderTime) => a.hour === b.hour && a.days.join() === b.days.join();

/** Settings → reminders on this phone: the hour and days, permission asked only when the person taps to turn it on. */
export function ReminderCard() {
  const [state, setState] = useState<ReminderState | null | "offline">(null);
  const [time, setTime] = useState<ReminderTime>({ hour: 7, days: [...everyDay] });
  const [busy, setBusy] = useState<null | "on" | "save" | "test" | "off">(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [support, setSupport] = useState<ReturnType<typeof readPushSupport> | null>(null);
  const [lost, setLost] = useState(false);

  async function refresh() {
    const res = await loadReminderState();
    if (!res.ok) {
      setState("offline");
      return;
    }
    // A phone whose browser dropped the subscription is not reminded any more: offer to turn it on again.
    const phone = await checkThisPhone(res.data.here);
    setLost(phone === "lost");
    setState(phone === "lost" ? { ...res.data, here: null } : res.data);
    const chosen = res.data.here ?? res.data.elsewhere;
    if (chosen) setTime({ hour: chosen.hour, days: chosen.days });
  }
  useEffect(() => {
    setSupport(readPushSupport());
    void refresh();
  }, []);

  async function run(kind: NonNullable<typeof busy>, action: () => Promise<{ ok: boolean; message?: string }>, done: string) {
    setBusy(kind);
    setMessage(null);
    const res = await action();
    setBusy(null);
    setSupport(readPushSupport());
    setMessage(res.ok ? { ok: true, text: done } : { ok: false, text: res.message ?? "That did not work." });
    if (res.ok) await refresh();
  }
  const toggleDay = (day: number) =>
    setTime((t) => ({ ...t, days: t.days.includes(day) ? t.days.filter((d) => d !== day) : [...t.days, day].sort() }));

  const ready = state !== null && state !== "offline";
  const here = ready ? state.here : null;
  const zone = ready ? state.timezone : "";
  const blocked = support?.permission === "denied";
  const canTurnOn = ready && state.available && support?.supported && !blocked;

  return (
    <Card>
      <h2 className="mb-1 text-body font-bold text-glacier-800">Reminders on this phone</h2>
      <p className="mb-3 text-label text-ink-soft">
        A nudge at the hour you choose when bags are due: how many, in which cold store, and the most urgent (mould, roots, past the latest pull). Nothing
        when nothing is due.
      </p>
      {state === null ? <p className="text-label text-ink-soft">Checking…</p> : null}
      {state === "offline" ? <Notice>Setting up reminders needs a connection. Try again when you have signal.</Notice> : null}
      {ready && !state.available ? (
        // Not the person's doing and nothing is broken: said calmly, not as an error.
        <p className="rounded-xl bg-rime-50 px-3 py-2 text-label text-ink">
          Phone reminders are turned off on this server: the farm&apos;s administrator has not set up its push keys yet. The daily e-mail still works.
        </p>
      ) : null}
      {ready && state.available && support && !support.supported ? (
        <Notice>This browser cannot show reminders. On an iPhone, add Rimebook to the Home Screen first, then open it from there.</Notice>
      ) : null}
      {ready && state.available && blocked ? (
        <Notice>Notifications are blocked for Rimebook in this browser. Allow them in the browser&apos;s site settings, then come back here.</Notice>
      ) : null}

      {lost ? <Notice className="mb-3">This phone&apos;s browser stopped accepting reminders. Tap “Remind me on this phone” to turn them on again.</Notice> : null}
      {here ? (
        <p role="status" className="mb-3 rounded-xl bg-moss-100 px-3 py-2 text-label font-semibold text-moss-700">
          On: this phone reminds you at {formatHour(here.hour)} ({zone}), {describeReminderDays(here.days)}.
        </p>
      ) : null}

      {ready && state.available ? (
        <div className="space-y-4">
          <Field label={`Hour (farm time, ${zone})`} htmlFor="reminder-hour">
            <Select id="reminder-hour" value={time.hour} onChange={(e) => setTime((t) => ({ ...t, hour: Number(e.target.value) }))}>
              {hours.map((h) => (
                <option key={h} value={h}>
                  {formatHour(h)}
                </option>
              ))}
            </Select>
          </Field>
          <fieldset>
            <legend className="mb-1 text-label font-semibold text-ink">Days</legend>
            <div className="flex flex-wrap gap-2">
              {reminderWeekdays.map((w) => (
                <Chip key={w.day} pressed={time.days.includes(w.day)} onClick={() => toggleDay(w.day)}>
                  {w.label}
                </Chip>
              ))}
            </div>
            {time.days.length === 0 ? <Notice className="mt-1">Choose at least one day.</Notice> : null}
          </fieldset>

          {here ? (
            <div className="flex flex-col gap-2">
              {!sameTime(time, here) ? (
                <Button disabled={busy !== null || time.days.length === 0} onClick={() => run("save", () => saveReminderTime(time), "Saved. Your other phones on this farm follow the same hour and days.")}>
                  {busy === "save" ? "Saving…" : "Save hour and days"}
                </Button>
              ) : null}
              <Button tone="secondary" disabled={busy !== null} onClick={() => run("test", sendTestReminder, "Sent. It should show on this phone within a minute.")}>
                {busy === "test" ? "Sending…" : "Send me a test reminder"}
              </Button>
              <Button tone="quiet" disabled={busy !== null} onClick={() => run("off", stopRemindersOnThisPhone, "Reminders from this farm are off on this phone.")}>
                {busy === "off" ? "Stopping…" : "Stop reminders on this phone"}
              </Button>
            </div>
          ) : (
            <Button
              className="w-full"
              disabled={!canTurnOn || busy !== null || time.days.length === 0}
              onClick={() => run("on", () => remindMeOnThisPhone(state.publicKey!, time), "Reminders are on for this phone. Try “Send me a test reminder”.")}
            >
              {busy === "on" ? "Asking the phone…" : "Remind me on this phone"}
            </Button>
          )}
          {!here && canTurnOn ? <p className="text-label text-ink-soft">The phone asks whether Rimebook may show notifications; say Allow.</p> : null}
        </div>
      ) : null}
      {message ? <Notice ok={message.ok} className="mt-3">{message.text}</Notice> : null}
    </Card>
  );
}
