"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { SowingInput } from "@/lib/schemas/sowing";
import type { Bag } from "@/lib/schemas/bag";
import { pullBag, recordSowing } from "@/lib/client/repo";
import { Button } from "@/components/ui/Button";
import { Field, Input, TextArea } from "@/components/ui/Field";
import { describeSaveError } from "@/components/bags/save-error";
import { Notice } from "@/components/season/Notice";

const SowingFormSchema = SowingInput.pick({ sown_on: true, tray: true, cells: true, seeds_sown: true, note: true });
type SowingFormValues = z.input<typeof SowingFormSchema>;

const numberOrNull = (v: unknown) => (v === "" || v === null || v === undefined ? null : Number(v));

/** Record a sowing (tray, cells, seeds sown); a bag not yet pulled is pulled the same day first. */
export function SowingForm({ bag, today, onDone }: { bag: Pick<Bag, "id" | "seed_count" | "pulled_on">; today: string; onDone?: () => void }) {
  const [saveError, setSaveError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<SowingFormValues, unknown, z.output<typeof SowingFormSchema>>({
    resolver: zodResolver(SowingFormSchema),
    defaultValues: { sown_on: today, tray: null, cells: null, seeds_sown: bag.seed_count ?? undefined, note: null },
  });

  const submit = handleSubmit(async (values) => {
    setSaveError(null);
    if (bag.pulled_on && values.sown_on < bag.pulled_on) {
      setSaveError(`The bag was pulled on ${bag.pulled_on}; it cannot be sown before that.`);
      return;
    }
    if (values.sown_on > today) {
      setSaveError("Record the sowing on the day you sow.");
      return;
    }
    try {
      if (!bag.pulled_on) await pullBag(bag.id, values.sown_on);
      await recordSowing({ ...values, bag_id: bag.id, tray: values.tray || null, note: values.note || null });
      onDone?.();
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  const id = `sowing-${bag.id}`;
  return (
    <form onSubmit={submit} noValidate className="space-y-3" aria-label="Record a sowing">
      <div className="grid grid-cols-2 gap-3">
        <Field label="Sown on" htmlFor={`${id}-on`} error={errors.sown_on?.message}>
          <Input id={`${id}-on`} type="date" max={today} aria-invalid={!!errors.sown_on} {...register("sown_on")} />
        </Field>
        <Field label="Seeds sown" htmlFor={`${id}-seeds`} error={errors.seeds_sown?.message}>
          <Input id={`${id}-seeds`} inputMode="numeric" aria-invalid={!!errors.seeds_sown} {...register("seeds_sown", { setValueAs: numberOrNull })} />
        </Field>
        <Field label="Tray" htmlFor={`${id}-tray`} error={errors.tray?.message}>
          <Input id={`${id}-tray`} placeholder="e.g. Tray 4" {...register("tray")} />
        </Field>
        <Field label="Cells" htmlFor={`${id}-cells`} error={errors.cells?.message}>
          <Input id={`${id}-cells`} inputMode="numeric" placeholder="e.g. 72" aria-invalid={!!errors.cells} {...register("cells", { setValueAs: numberOrNull })} />
        </Field>
      </div>
      <Field label="Note" htmlFor={`${id}-note`} error={errors.note?.message}>
        <TextArea id={`${id}-note`} rows={2} {...register("note")} />
      </Field>
      <Notice>{saveError}</Notice>
      <Button type="submit" size="lg" className="w-full" disabled={isSubmitting}>
        {bag.pulled_on ? "Record sowing" : "Pull and record sowing"}
      </Button>
    </form>
  );
}
