"use client";

import { useEffect, useMemo, useState } from "react";
import { Controller, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { useLiveQuery } from "dexie-react-hooks";
import { FarmSettings } from "@/lib/schemas/farm";
import { getLocalDb } from "@/lib/client/db";
import { setDigestOptIn, updateFarmSettings } from "@/lib/client/repo";
import { vocabularyLabels } from "@/lib/schemas/words";
import { Button } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Field, Input, Select } from "@/components/ui/Field";
import { Segmented } from "@/components/ui/Segmented";
import { SessionActions } from "@/components/team/SessionActions";
import { describeSaveError } from "@/components/bags/save-error";
import { useMember } from "@/components/season/use-member";
import { countDaysInMonth, describeMonthDay, joinMonthDay, monthNames, splitMonthDay } from "./frost-date";
import { Notice } from "@/components/season/Notice";
import { FarmSwitcherCard, PasswordCard, ProfileCard } from "./AccountCards";
import { ReminderCard } from "./ReminderCard";

const FarmForm = FarmSettings.pick({ name: true, last_frost_date: true, location_note: true, temperature_unit: true, weekly_check_days: true, timezone: true });
type FarmFormValues = z.input<typeof FarmForm>;

function listTimeZones(current: string): string[] {
  const all = typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
  return [...new Set(["UTC", current, ...all])];
}

export function SettingsScreen() {
  const { identity, can } = useMember();
  return (
    <div className="mx-auto max-w-xl space-y-4 px-4 pb-28 pt-4">
      <PageHeader title="Settings" subtitle={identity ? `${identity.farm.name} · you are ${vocabularyLabels.role[identity.role]}` : undefined} />
      {identity === undefined ? <p className="text-ink-soft">Opening…</p> : null}
      {identity ? <FarmSwitcherCard identity={identity} /> : null}
      {identity ? <FarmCard key={identity.farm.id} farm={identity.farm} canEdit={can("farm.update")} /> : null}
      {identity ? <DigestCard userId={identity.user.id} email={identity.user.email} /> : null}
      {identity ? <ReminderCard key={`${identity.user.id}:${identity.farm.id}`} /> : null}
      {identity ? <ProfileCard key={identity.user.id} identity={identity} /> : null}
      {identity ? <PasswordCard /> : null}
      <Card>
        <h2 className="mb-2 text-body font-bold text-glacier-800">Signing out</h2>
        <SessionActions />
      </Card>
    </div>
  );
}

function FarmCard({ farm, canEdit }: { farm: NonNullable<ReturnType<typeof useMember>["identity"]>["farm"]; canEdit: boolean }) {
  const [saved, setSaved] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const zones = useMemo(() => listTimeZones(farm.timezone ?? "UTC"), [farm.timezone]);
  const {
    register,
    control,
    handleSubmit,
    watch,
    reset,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<FarmFormValues, unknown, z.output<typeof FarmForm>>({
    resolver: zodResolver(FarmForm),
    defaultValues: {
      name: farm.name,
      last_frost_date: farm.last_frost_date ?? null,
      location_note: farm.location_note ?? null,
      temperature_unit: farm.temperature_unit === "F" ? "F" : "C",
      weekly_check_days: farm.weekly_check_days ?? 7,
      timezone: farm.timezone ?? "UTC",
    },
  });
  const frost = describeMonthDay(watch("last_frost_date"));

  const submit = handleSubmit(async (values) => {
    setSaved(null);
    setSaveError(null);
    try {
      await updateFarmSettings({ ...values, location_note: values.location_note || null });
      reset(values);
      setSaved("Saved on this phone; it reaches the team when the phone syncs.");
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  const disabled = !canEdit;
  return (
    <Card>
      <h2 className="mb-1 text-body font-bold text-glacier-800">The farm</h2>
      {!canEdit ? <p className="mb-3 text-label text-ink-soft">Only the Owner changes these.</p> : null}
      <form onSubmit={submit} noValidate className="space-y-4" aria-label="Farm settings">
        <fieldset disabled={disabled} className="space-y-4">
          <Field label="Farm name" htmlFor="farm-name" error={errors.name?.message}>
            <Input id="farm-name" aria-invalid={!!errors.name} {...register("name")} />
          </Field>
          <Controller
            control={control}
            name="last_frost_date"
            render={({ field }) => {
              const parts = splitMonthDay(field.value) ?? { month: 0, day: 0 };
              return (
                <fieldset className="space-y-1">
                  <legend className="text-label font-semibold text-ink">Average last spring frost</legend>
                  <div className="grid grid-cols-[2fr_1fr] gap-2">
                    <Select
                      aria-label="Month of the last frost"
                      value={parts.month || ""}
                      onChange={(e) => field.onChange(e.target.value ? joinMonthDay(Number(e.target.value), parts.day || 1) : null)}
                    >
                      <option value="">Not set</option>
                      {monthNames.map((m, i) => (
                        <option key={m} value={i + 1}>
                          {m}
                        </option>
                      ))}
                    </Select>
                    <Select
                      aria-label="Day of the last frost"
                      value={parts.day || ""}
                      disabled={!parts.month || disabled}
                      onChange={(e) => field.onChange(joinMonthDay(parts.month, Number(e.target.value)))}
                    >
                      {Array.from({ length: parts.month ? countDaysInMonth(parts.month) : 31 }, (_, i) => (
                        <option key={i + 1} value={i + 1}>
                          {i + 1}
                        </option>
                      ))}
                    </Select>
                  </div>
                  <p className="text-label text-ink-soft">
                    {frost ? `${frost}: the season plan counts sowing dates from here.` : "The season plan counts sowing dates from this day; your extension service or local growers know it."}
                  </p>
                  <Notice>{errors.last_frost_date?.message}</Notice>
                </fieldset>
              );
            }}
          />
          <Field label="Where the farm is" htmlFor="farm-location" hint="A note for the team, e.g. valley floor, frost pocket." error={errors.location_note?.message}>
            <Input id="farm-location" {...register("location_note")} />
          </Field>
          <Controller
            control={control}
            name="temperature_unit"
            render={({ field }) => (
              <Segmented
                legend="Temperatures in"
                name="farm-unit"
                options={[
                  { value: "C", label: "°C" },
                  { value: "F", label: "°F" },
                ]}
                value={field.value ?? "C"}
                onChange={field.onChange}
              />
            )}
          />
          <Field label="Days between checks while chilling" htmlFor="farm-weekly" hint="Daily checks start when a pull window opens." error={errors.weekly_check_days?.message}>
            <Input id="farm-weekly" inputMode="numeric" aria-invalid={!!errors.weekly_check_days} {...register("weekly_check_days", { setValueAs: (v) => (v === "" ? undefined : Number(v)) })} />
          </Field>
          <Field label="Time zone" htmlFor="farm-zone" hint="Logger files without a time zone are read in this one." error={errors.timezone?.message}>
            <Select id="farm-zone" {...register("timezone")}>
              {zones.map((z) => (
                <option key={z} value={z}>
                  {z}
                </option>
              ))}
            </Select>
          </Field>
        </fieldset>
        <Notice>{saveError}</Notice>
        <Notice ok>{saved}</Notice>
        {canEdit ? (
          <Button type="submit" className="w-full" disabled={isSubmitting || !isDirty}>
            Save farm settings
          </Button>
        ) : null}
      </form>
    </Card>
  );
}

function DigestCard({ userId, email }: { userId: string; email: string }) {
  const membership = useLiveQuery(async () => (await getLocalDb().memberships.where("user_id").equals(userId).first()) ?? null, [userId]);
  const [error, setError] = useState<string | null>(null);
  const [on, setOn] = useState<boolean | null>(null);
  useEffect(() => setOn(membership ? !!membership.digest_opt_in : null), [membership]);
  async function toggle(next: boolean) {
    setError(null);
    setOn(next);
    try {
      await setDigestOptIn(next);
    } catch (e) {
      setOn(!next);
      setError(describeSaveError(e));
    }
  }
  return (
    <Card>
      <h2 className="mb-1 text-body font-bold text-glacier-800">Daily e-mail</h2>
      <p className="mb-3 text-label text-ink-soft">Each morning: bags due, windows opening, overdue pulls, mould found yesterday and cold-store excursions. Sent to {email}.</p>
      <label className="flex min-h-tap items-center justify-between gap-3 rounded-xl bg-rime-50 px-3 py-2">
        <span className="text-body font-semibold">Send me the daily e-mail</span>
        <input
          type="checkbox"
          role="switch"
          aria-checked={!!on}
          className="h-7 w-7 accent-glacier-700"
          checked={!!on}
          disabled={on === null}
          onChange={(e) => void toggle(e.target.checked)}
        />
      </label>
      {membership === null ? <p className="mt-2 text-label text-ink-soft">Your membership has not synced to this phone yet.</p> : null}
      <Notice>{error}</Notice>
    </Card>
  );
}
