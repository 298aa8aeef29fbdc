"use client";

import { useEffect, useImperativeHandle, useRef, type Ref } from "react";
import { Controller, useForm, type Resolver } from "react-hook-form";
import { cadenceFor } from "@/lib/domain/rows/round-input";
import { adviseOnFindings, type CheckAdvice } from "@/lib/domain/schedule";
import type { IsoDay } from "@/lib/domain/dates";
import { formatTemperature, type TemperatureUnit } from "@/lib/domain/units";
import { checkActions, moistureLevels, mouldLevels, sproutLevels, vocabularyLabels, type Moisture, type Mould, type Sprouts } from "@/lib/schemas/words";
import type { Check } from "@/lib/schemas/check";
import { cautionTexts } from "@/components/ui/Caution";
import { Field, Input, TextArea } from "@/components/ui/Field";
import { Segmented } from "@/components/ui/Segmented";
import { formatShortDay } from "@/components/bags/format-day";
import { allGoodDraft, previewCheck, toggleAction, type BagForCheck, type CheckDraft } from "./check-draft";

// The check sheet's details (findings, what was done, temperature, note, photo) with react-hook-form: loaded
// beside the sheet's hydration, out of its first load, since "All good" is one tap without them
// (CheckSheet). The service worker precaches this chunk like every other, so it loads with no signal.

/** What the sheet asks of the form: its values, its errors shown on the fields, and a checked submit. */
export type CheckFormHandle = {
  getValues: () => CheckDraft;
  showErrors: (fields: { temperature?: string; note?: string; form?: string }) => void;
  submit: () => Promise<void>;
};

export type SaveCheck = (values: CheckDraft) => Promise<{ temperature?: string; note?: string; form?: string } | null>;

const moistureTone = (v: Moisture) => (v === "damp" ? "good" : "attention");
const mouldTone = (v: Mould) => (v === "clean" ? "good" : v === "spots" ? "attention" : "danger");
const sproutsTone = (v: Sprouts) => (v === "none" ? "neutral" : "good");
// Pulling and discarding are steps of their own (with a date), not ticks among what was done.
const sheetActions = checkActions.filter((a) => a !== "pulled" && a !== "discarded");
const options = <T extends string>(values: readonly T[], labels: Record<T, string>) => values.map((value) => ({ value, label: labels[value] }));

export function CheckDetails({
  handle,
  bag,
  today,
  unit,
  weeklyCheckDays,
  lastCheck,
  entered,
  check,
  onDraft,
  onValid,
  photo,
}: {
  handle: Ref<CheckFormHandle>;
  bag: BagForCheck;
  today: IsoDay;
  unit: TemperatureUnit;
  weeklyCheckDays: number | null | undefined;
  lastCheck: Check | null;
  entered: boolean;
  /** The save's checks: null when the values may be saved, else the fields to mark. */
  check: SaveCheck;
  onDraft: (draft: CheckDraft) => void;
  /** A submit whose values passed the save's checks. */
  onValid: (values: CheckDraft) => void;
  photo: React.ReactNode;
}) {
  // The resolver is kept by the form from its first render; it reads the save's checks through a ref.
  const checkRef = useRef(check);
  checkRef.current = check;
  const resolver: Resolver<CheckDraft> = async (values) => {
    const fields = await checkRef.current(values);
    if (!fields) return { values, errors: {} };
    const errors: Record<string, { type: string; message: string }> = {};
    if (fields.temperature) errors.temperatureText = { type: "invalid", message: fields.temperature };
    if (fields.note) errors.note = { type: "invalid", message: fields.note };
    if (fields.form) errors.root = { type: "invalid", message: fields.form };
    return { values: {}, errors };
  };
  const form = useForm<CheckDraft>({ defaultValues: allGoodDraft, resolver });
  const draft = form.watch();

  // The sheet chooses its steps from what is entered, so it hears every change.
  const onDraftRef = useRef(onDraft);
  onDraftRef.current = onDraft;
  const onValidRef = useRef(onValid);
  onValidRef.current = onValid;
  const submit = form.handleSubmit((values) => onValidRef.current(values));
  useEffect(() => {
    const sub = form.watch((values) => onDraftRef.current({ ...allGoodDraft, ...values } as CheckDraft));
    return () => sub.unsubscribe();
  }, [form]);

  useImperativeHandle(
    handle,
    () => ({
      getValues: () => form.getValues(),
      showErrors: (fields) => {
        if (fields.temperature) form.setError("temperatureText", { type: "invalid", message: fields.temperature });
        if (fields.note) form.setError("note", { type: "invalid", message: fields.note });
      },
      submit: () => submit(),
    }),
    [form, submit],
  );

  const preview = previewCheck(draft, bag, today, cadenceFor(weeklyCheckDays), formatShortDay);
  const findingAdvice = adviseOnFindings(draft);

  return (
    <form onSubmit={(e) => void submit(e)} className="space-y-5" aria-labelledby="details-heading" noValidate>
      <h2 id="details-heading" className="border-t-2 border-rime-200 pt-4 text-title font-bold text-glacier-800">
        {entered ? "What you found" : "Or record what you found"}
      </h2>
      <Controller
        control={form.control}
        name="moisture"
        render={({ field }) => (
          <Segmented legend="Moisture" name="moisture" options={options(moistureLevels, vocabularyLabels.moisture)} value={field.value} onChange={field.onChange} tone={moistureTone} />
        )}
      />
      <FindingAdvice advice={findingAdvice.moisture} testId="advice-moisture" />
      <Controller
        control={form.control}
        name="mould"
        render={({ field }) => (
          <Segmented legend="Mould" name="mould" options={options(mouldLevels, vocabularyLabels.mould)} value={field.value} onChange={field.onChange} tone={mouldTone} />
        )}
      />
      <FindingAdvice advice={findingAdvice.mould} testId="advice-mould">
        {preview.showMouldCaution ? <span className="block text-ink-soft">{cautionTexts.mould}</span> : null}
      </FindingAdvice>
      <Controller
        control={form.control}
        name="sprouts"
        render={({ field }) => (
          <Segmented legend="Sprouts" name="sprouts" options={options(sproutLevels, vocabularyLabels.sprouts)} value={field.value} onChange={field.onChange} tone={sproutsTone} />
        )}
      />
      <FindingAdvice advice={findingAdvice.sprouts} testId="advice-sprouts" />

      <p className="rounded-card bg-rime-100 p-3 text-label font-semibold" data-testid="advice" aria-live="polite">
        {preview.nextText}
      </p>

      <Controller
        control={form.control}
        name="actions"
        render={({ field }) => (
          <fieldset className="space-y-1">
            <legend className="text-label font-semibold">What you did (tick all that apply)</legend>
            <div className="grid grid-cols-2 gap-2">
              {sheetActions.map((a) => {
                const on = field.value.includes(a);
                return (
                  <label
                    key={a}
                    className={`flex min-h-tap cursor-pointer items-center gap-2 rounded-card border-2 px-3 py-2 text-label font-semibold has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-glacier-500 ${
                      on ? "border-glacier-700 bg-rime-200 text-glacier-800" : "border-rime-300 bg-paper"
                    }`}
                  >
                    <input type="checkbox" className="h-5 w-5 accent-glacier-700" checked={on} onChange={() => field.onChange(toggleAction(field.value, a))} />
                    {vocabularyLabels.checkAction[a]}
                  </label>
                );
              })}
            </div>
          </fieldset>
        )}
      />

      <Field label={`Store temperature (°${unit}), if you read it`} htmlFor="check-temperature" error={form.formState.errors.temperatureText?.message} hint="Optional; it is also kept as a reading for this store.">
        <Input
          id="check-temperature"
          autoComplete="off"
          placeholder={unit === "F" ? "e.g. 38" : "e.g. 3.5"}
          {...form.register("temperatureText")}
          aria-invalid={form.formState.errors.temperatureText ? true : undefined}
        />
      </Field>
      {lastCheck?.temperature_c !== null && lastCheck?.temperature_c !== undefined ? (
        <p className="-mt-3 text-label text-ink-soft">Last time: {formatTemperature(lastCheck.temperature_c, unit)}</p>
      ) : null}

      <Field label="Note" htmlFor="check-note" error={form.formState.errors.note?.message}>
        <TextArea id="check-note" rows={2} {...form.register("note")} aria-invalid={form.formState.errors.note ? true : undefined} />
      </Field>

      {photo}

      {form.formState.errors.root?.message ? (
        <p role="alert" className="text-label font-medium text-ember-700">
          {form.formState.errors.root.message}
        </p>
      ) : null}
    </form>
  );
}

/** The advice for one finding, right under the choice that caused it. */
function FindingAdvice({ advice, testId, children }: { advice: CheckAdvice | null; testId: string; children?: React.ReactNode }) {
  if (!advice) return null;
  const frame = advice.level === "act_now" ? "border-ember-600 bg-ember-100" : "border-wheat-600 bg-wheat-100";
  return (
    <div className={`-mt-3 space-y-1 rounded-card border-l-4 p-3 text-label ${frame}`} data-testid={testId} role="status">
      <p className="font-semibold">{advice.headline}</p>
      {advice.steps.length ? (
        <ul className="list-disc space-y-1 pl-5">
          {advice.steps.map((s) => (
            <li key={s}>{s}</li>
          ))}
        </ul>
      ) : null}
      {children}
    </div>
  );
}
