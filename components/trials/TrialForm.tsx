"use client";

import { useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { TrialDetails, TrialInput, type Trial } from "@/lib/schemas/trial";
import type { Lot } from "@/lib/schemas/lot";
import { createTrial, updateTrial } from "@/lib/client/repo";
import { Button } from "@/components/ui/Button";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { describeSaveError } from "@/components/bags/save-error";
import { FormActions } from "@/components/ui/FormActions";
import { pickChangedFields } from "./trial-manage";

// The shared trial schema without ids (the phone makes them); arms as label + treatment.
export const TrialForm = TrialInput.omit({ id: true, notes: true }).extend({
  arms: z
    .array(z.object({ label: TrialInput.shape.arms.element.shape.label, treatment: TrialInput.shape.arms.element.shape.treatment }))
    .min(2, { error: "A trial compares at least two treatments." })
    .max(8, { error: "Compare at most eight treatments at once." }),
});
type TrialFormValues = z.input<typeof TrialForm>;

export function NewTrialForm({ lots, onDone }: { lots: readonly Lot[]; onDone: (id: string | null) => void }) {
  const [saveError, setSaveError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<TrialFormValues, unknown, z.output<typeof TrialForm>>({
    resolver: zodResolver(TrialForm),
    defaultValues: { name: "", lot_id: null, question: null, arms: [{ label: "", treatment: null }, { label: "", treatment: null }] },
  });
  const { fields, append, remove } = useFieldArray({ control, name: "arms" });

  const submit = handleSubmit(async (values) => {
    setSaveError(null);
    try {
      const saved = await createTrial({
        ...values,
        question: values.question || null,
        notes: null,
        arms: values.arms.map((a, i) => ({ id: crypto.randomUUID(), label: a.label, treatment: a.treatment || null, position: i })),
      });
      onDone(saved.id);
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label="New trial">
      <Field label="Name" htmlFor="trial-name" error={errors.name?.message}>
        <Input id="trial-name" placeholder="e.g. Coneflower: fridge or freezer?" aria-invalid={!!errors.name} {...register("name")} />
      </Field>
      <Field label="Seed lot" htmlFor="trial-lot" hint="Compare treatments on one lot, so the seed itself is not the difference.">
        <Select id="trial-lot" {...register("lot_id", { setValueAs: (v) => v || null })}>
          <option value="">Choose a lot</option>
          <LotOptions lots={lots} />
        </Select>
      </Field>
      <Field label="Question" htmlFor="trial-question" error={errors.question?.message}>
        <TextArea id="trial-question" rows={2} placeholder="e.g. Does a month in the freezer do as well as a month in the fridge?" {...register("question", { setValueAs: (v) => v || null })} />
      </Field>
      <fieldset className="space-y-3">
        <legend className="text-label font-semibold text-ink">Treatments (arms)</legend>
        {fields.map((f, i) => (
          <div key={f.id} className="space-y-2 rounded-xl bg-rime-50 p-3">
            <Field label={`Arm ${i + 1}`} htmlFor={`arm-${i}-label`} error={errors.arms?.[i]?.label?.message}>
              <Input id={`arm-${i}-label`} placeholder={i === 0 ? "e.g. Fridge 4 weeks" : "e.g. Freezer 4 weeks"} aria-invalid={!!errors.arms?.[i]?.label} {...register(`arms.${i}.label`)} />
            </Field>
            <Field label="What is done" htmlFor={`arm-${i}-treatment`} error={errors.arms?.[i]?.treatment?.message}>
              <Input id={`arm-${i}-treatment`} placeholder="Store, temperature, medium, days" {...register(`arms.${i}.treatment`, { setValueAs: (v) => v || null })} />
            </Field>
            {fields.length > 2 ? (
              <Button tone="quiet" onClick={() => remove(i)}>
                Remove arm {i + 1}
              </Button>
            ) : null}
          </div>
        ))}
        {errors.arms?.root?.message || errors.arms?.message ? (
          <p role="alert" className="text-label font-medium text-ember-700">
            {errors.arms?.root?.message ?? errors.arms?.message}
          </p>
        ) : null}
        {fields.length < 8 ? (
          <Button tone="secondary" onClick={() => append({ label: "", treatment: null })}>
            Add an arm
          </Button>
        ) : null}
      </fieldset>
      <FormActions error={saveError} submitLabel="Create trial" busy={isSubmitting} onCancel={() => onDone(null)} />
    </form>
  );
}

// Editing keeps the arms as they are (bags point at them); only the trial's own words and lot change.
type TrialEditValues = z.input<typeof TrialDetails>;
type TrialEditOutput = z.output<typeof TrialDetails>;

export function EditTrialForm({ trial, lots, onDone }: { trial: Trial; lots: readonly Lot[]; onDone: (saved: boolean) => void }) {
  const [saveError, setSaveError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting, dirtyFields },
  } = useForm<TrialEditValues, unknown, TrialEditOutput>({
    resolver: zodResolver(TrialDetails),
    defaultValues: { name: trial.name, lot_id: trial.lot_id, question: trial.question, notes: trial.notes },
  });

  const submit = handleSubmit(async (values) => {
    setSaveError(null);
    const patch = pickChangedFields(values, dirtyFields);
    if (Object.keys(patch).length === 0) return onDone(false);
    try {
      await updateTrial(trial.id, patch);
      onDone(true);
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label={`Edit ${trial.name}`}>
      <Field label="Name" htmlFor="edit-trial-name" error={errors.name?.message}>
        <Input id="edit-trial-name" aria-invalid={!!errors.name} aria-describedby={errors.name ? "edit-trial-name-error" : undefined} {...register("name")} />
      </Field>
      <Field label="Seed lot" htmlFor="edit-trial-lot" hint="The trial lists this lot's bags. Bags already in an arm stay in it.">
        <Select id="edit-trial-lot" {...register("lot_id", { setValueAs: (v) => v || null })}>
          <option value="">No lot</option>
          <LotOptions lots={lots} />
        </Select>
      </Field>
      <Field label="Question" htmlFor="edit-trial-question" error={errors.question?.message}>
        <TextArea id="edit-trial-question" rows={2} aria-invalid={!!errors.question} aria-describedby={errors.question ? "edit-trial-question-error" : undefined} {...register("question", { setValueAs: (v) => v || null })} />
      </Field>
      <Field label="Notes" htmlFor="edit-trial-notes" hint="What you did differently, what you saw, what to try next." error={errors.notes?.message}>
        <TextArea id="edit-trial-notes" rows={3} aria-invalid={!!errors.notes} aria-describedby={errors.notes ? "edit-trial-notes-error" : undefined} {...register("notes", { setValueAs: (v) => v || null })} />
      </Field>
      <FormActions error={saveError} submitLabel="Save changes" busy={isSubmitting} onCancel={() => onDone(false)} />
    </form>
  );
}

function LotOptions({ lots }: { lots: readonly Lot[] }) {
  return lots.map((l) => (
    <option key={l.id} value={l.id}>
      {l.species}
      {l.source ? ` · ${l.source}` : ""}
      {l.year ? ` ${l.year}` : ""}
    </option>
  ));
}
