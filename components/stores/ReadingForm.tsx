"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { ZodError } from "zod";
import { AppError } from "@/lib/errors";
import { formatTemperature, parseTemperature, type TemperatureUnit } from "@/lib/domain/units";
import { recordReading } from "@/lib/client/repo";
import { Button } from "@/components/ui/Button";
import { Field, Input } from "@/components/ui/Field";
import { describeSaveError } from "@/components/bags/save-error";
import { Notice } from "@/components/season/Notice";

// What the grower types: a temperature in words ("4", "39 °F", "−18") and a local date-time.
const ReadingForm = z.object({
  temperature: z.string().trim().min(1, { error: "Enter the temperature you read." }),
  takenAt: z.string().min(1, { error: "When was it read?" }),
});
type ReadingFormValues = z.infer<typeof ReadingForm>;

/** "2026-12-02T08:30" for a datetime-local input, in this phone's time. */
export function toLocalInputValue(d: Date): string {
  const p = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}T${p(d.getHours())}:${p(d.getMinutes())}`;
}

export function ReadingEntry({ storeId, unit }: { storeId: string; unit: TemperatureUnit }) {
  const [saved, setSaved] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<ReadingFormValues>({ resolver: zodResolver(ReadingForm), defaultValues: { temperature: "", takenAt: toLocalInputValue(new Date()) } });

  const submit = handleSubmit(async ({ temperature, takenAt }) => {
    setSaved(null);
    let celsius: number;
    try {
      celsius = parseTemperature(temperature, unit).celsius;
    } catch (e) {
      setError("temperature", { message: e instanceof AppError ? e.message : "Type a number such as 4." });
      return;
    }
    const at = new Date(takenAt);
    if (Number.isNaN(at.getTime())) return setError("takenAt", { message: "Pick a date and time." });
    if (at.getTime() > Date.now() + 5 * 60_000) return setError("takenAt", { message: "That time is still to come; enter when you read it." });
    try {
      await recordReading({ store_id: storeId, taken_at: at.toISOString(), temperature_c: Math.round(celsius * 100) / 100, origin: "manual", check_id: null });
      setSaved(`Saved ${formatTemperature(celsius, unit)}.`);
      reset({ temperature: "", takenAt: toLocalInputValue(new Date()) });
    } catch (e) {
      if (e instanceof ZodError && e.issues.some((i) => i.path[0] === "temperature_c")) {
        setError("temperature", { message: e.issues.find((i) => i.path[0] === "temperature_c")!.message });
      } else setError("root", { message: describeSaveError(e) });
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-3" aria-label="Add a reading">
      <div className="grid grid-cols-2 gap-3">
        <Field label={`Temperature (°${unit})`} htmlFor="reading-temp" error={errors.temperature?.message}>
          <Input id="reading-temp" inputMode="decimal" autoComplete="off" placeholder={unit === "F" ? "e.g. 38" : "e.g. 3.5"} aria-invalid={!!errors.temperature} {...register("temperature")} />
        </Field>
        <Field label="Read at" htmlFor="reading-at" error={errors.takenAt?.message}>
          <Input id="reading-at" type="datetime-local" aria-invalid={!!errors.takenAt} {...register("takenAt")} />
        </Field>
      </div>
      <Notice>{errors.root?.message}</Notice>
      <Notice ok>{saved}</Notice>
      <Button type="submit" disabled={isSubmitting} className="w-full">
        Save reading
      </Button>
    </form>
  );
}
