"use client";

import { useState } from "react";
import { Controller, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import type { PlanItem } from "@/lib/schemas/plan";
import type { Lot } from "@/lib/schemas/lot";
import type { ProtocolRow } from "@/lib/client/db";
import { savePlanItem } from "@/lib/client/repo";
import { Button } from "@/components/ui/Button";
import { Segmented } from "@/components/ui/Segmented";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { describeSaveError } from "@/components/bags/save-error";
import { PlanForm, planFormToItem, planItemToForm, type PlanFormValues } from "./plan-form";
import { Notice } from "@/components/season/Notice";

const anchorOptions = [
  { value: "frost", label: "The last frost" },
  { value: "date", label: "A set date" },
] as const;
const placeOptions = [
  { value: "indoor", label: "Indoors (trays)" },
  { value: "outdoor", label: "Outdoors" },
] as const;

const numberOrNull = (v: unknown) => (v === "" || v === null || v === undefined ? null : Number(String(v).replace("−", "-").replace(",", ".")));

export function PlanItemForm({
  item,
  season,
  lots,
  protocols,
  onDone,
}: {
  item?: PlanItem;
  season: number;
  lots: readonly Lot[];
  protocols: readonly ProtocolRow[];
  onDone: () => void;
}) {
  const [saveError, setSaveError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    watch,
    setValue,
    control,
    formState: { errors, isSubmitting },
  } = useForm<PlanFormValues, unknown, z.output<typeof PlanForm>>({ resolver: zodResolver(PlanForm), defaultValues: planItemToForm(item) });
  const anchor = watch("anchor");
  const species = watch("species");
  const lotId = watch("lot_id");
  const speciesNames = [...new Set([...lots.map((l) => l.species), ...protocols.map((p) => p.species)])].sort();
  const sameSpecies = (s: string) => s.trim().toLowerCase() === (species ?? "").trim().toLowerCase();
  const lotChoices = [...lots].sort((a, b) => Number(sameSpecies(b.species)) - Number(sameSpecies(a.species)) || a.species.localeCompare(b.species));
  const protocolChoices = [...protocols].sort((a, b) => Number(sameSpecies(b.species)) - Number(sameSpecies(a.species)) || a.species.localeCompare(b.species));

  const submit = handleSubmit(async (values) => {
    setSaveError(null);
    try {
      await savePlanItem(planFormToItem(values, { id: item?.id, season, bag_id: item?.bag_id ?? null }));
      onDone();
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  const id = item?.id ?? "new";
  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label={item ? `Edit plan for ${item.species}` : "Add a species to the plan"}>
      <Field label="Species" htmlFor={`plan-species-${id}`} error={errors.species?.message}>
        <Input id={`plan-species-${id}`} list={`plan-species-list-${id}`} autoComplete="off" aria-invalid={!!errors.species} {...register("species")} />
        <datalist id={`plan-species-list-${id}`}>
          {speciesNames.map((s) => (
            <option key={s} value={s} />
          ))}
        </datalist>
      </Field>
      <Field label="Seed lot" htmlFor={`plan-lot-${id}`} hint="The lot the seed comes from; its count tells whether there is enough.">
        <Select
          id={`plan-lot-${id}`}
          {...register("lot_id", {
            setValueAs: (v) => v || null,
            onChange: (e) => {
              const lot = lots.find((l) => l.id === e.target.value);
              if (lot && !species) setValue("species", lot.species);
            },
          })}
        >
          <option value="">No lot yet</option>
          {lotChoices.map((l) => (
            <option key={l.id} value={l.id}>
              {l.species}
              {l.source ? ` · ${l.source}` : ""}
              {l.year ? ` ${l.year}` : ""}
              {l.quantity != null ? ` · ${l.quantity} seeds` : ""}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Protocol" htmlFor={`plan-protocol-${id}`} hint={lotId ? "Empty: the lot's protocol, else the farm's for this species." : "Empty: the farm's protocol for this species."}>
        <Select id={`plan-protocol-${id}`} {...register("protocol_id", { setValueAs: (v) => v || null })}>
          <option value="">Pick for me</option>
          {protocolChoices.map((p) => (
            <option key={p.id} value={p.id}>
              {p.species}
              {p.is_farm_own ? " (farm's own)" : ""}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Plants wanted" htmlFor={`plan-target-${id}`} error={errors.target_plants?.message}>
        <Input id={`plan-target-${id}`} inputMode="numeric" aria-invalid={!!errors.target_plants} {...register("target_plants", { setValueAs: numberOrNull })} />
      </Field>
      <fieldset className="space-y-2">
        <legend className="text-label font-semibold text-ink">Sowing</legend>
        <Controller
          control={control}
          name="anchor"
          render={({ field }) => (
            <Segmented legend="Counted from" name={`plan-anchor-${id}`} options={anchorOptions} value={field.value} onChange={field.onChange} />
          )}
        />
        {anchor === "frost" ? (
          <Field label="Weeks from the last frost" htmlFor={`plan-weeks-${id}`} hint="Negative is before the frost: −6 sows six weeks before." error={errors.weeks?.message}>
            <Input id={`plan-weeks-${id}`} inputMode="numeric" aria-invalid={!!errors.weeks} {...register("weeks", { setValueAs: numberOrNull })} />
          </Field>
        ) : (
          <Field label="Sowing date" htmlFor={`plan-date-${id}`} error={errors.date?.message}>
            <Input id={`plan-date-${id}`} type="date" aria-invalid={!!errors.date} {...register("date")} />
          </Field>
        )}
        <Controller
          control={control}
          name="place"
          render={({ field }) => <Segmented legend="Where" name={`plan-place-${id}`} options={placeOptions} value={field.value} onChange={field.onChange} />}
        />
      </fieldset>
      <div className="grid grid-cols-2 gap-3">
        <Field label="Expected germination %" htmlFor={`plan-germ-${id}`} hint="Empty: the farm's own record." error={errors.germinationPct?.message}>
          <Input id={`plan-germ-${id}`} inputMode="decimal" aria-invalid={!!errors.germinationPct} {...register("germinationPct", { setValueAs: numberOrNull })} />
        </Field>
        <Field label="Expected survival %" htmlFor={`plan-surv-${id}`} hint="Seedlings that become plants." error={errors.survivalPct?.message}>
          <Input id={`plan-surv-${id}`} inputMode="decimal" aria-invalid={!!errors.survivalPct} {...register("survivalPct", { setValueAs: numberOrNull })} />
        </Field>
      </div>
      <Field label="Note" htmlFor={`plan-note-${id}`} error={errors.note?.message}>
        <TextArea id={`plan-note-${id}`} rows={2} {...register("note", { setValueAs: (v) => v || null })} />
      </Field>
      <Notice>{saveError}</Notice>
      <div className="flex gap-3">
        <Button type="submit" className="flex-1" disabled={isSubmitting}>
          {item ? "Save plan row" : "Add to the plan"}
        </Button>
        <Button tone="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
