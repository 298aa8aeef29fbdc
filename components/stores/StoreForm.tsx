"use client";

import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { StoreInput, type Store } from "@/lib/schemas/store";
import { storeKinds, vocabularyLabels } from "@/lib/schemas/words";
import { createStore, updateStore } from "@/lib/client/repo";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { describeSaveError } from "@/components/bags/save-error";
import { useState } from "react";
import { FormActions } from "@/components/ui/FormActions";

// Boxes are typed one per line; the shared schema still checks each one.
const StoreFormSchema = StoreInput.omit({ id: true, boxes: true }).extend({ boxesText: z.string().max(6000) });
type StoreFormValues = z.input<typeof StoreFormSchema>;

export function splitBoxes(text: string): string[] {
  return [...new Set(text.split(/\r?\n|,/).map((b) => b.trim()).filter(Boolean))];
}

export function StoreForm({ store, onDone }: { store?: Store; onDone: (id: string | null) => void }) {
  const [saveError, setSaveError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    watch,
    formState: { errors, isSubmitting },
  } = useForm<StoreFormValues, unknown, z.output<typeof StoreFormSchema>>({
    resolver: zodResolver(StoreFormSchema),
    defaultValues: {
      name: store?.name ?? "",
      kind: store?.kind ?? "fridge",
      holds_food: store?.holds_food ?? false,
      notes: store?.notes ?? null,
      boxesText: (store?.boxes ?? []).join("\n"),
    },
  });
  const holdsFood = watch("holds_food");
  const kind = watch("kind");

  const submit = handleSubmit(async ({ boxesText, ...values }) => {
    setSaveError(null);
    try {
      const fields = { ...values, notes: values.notes || null, boxes: splitBoxes(boxesText) };
      if (store) {
        await updateStore(store.id, fields);
        onDone(store.id);
      } else {
        const saved = await createStore(fields);
        onDone(saved.id);
      }
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  const id = store?.id ?? "new";
  return (
    <form onSubmit={submit} className="space-y-4" noValidate aria-label={store ? `Edit ${store.name}` : "Add a cold store"}>
      <Field label="Name" htmlFor={`store-name-${id}`} error={errors.name?.message}>
        <Input id={`store-name-${id}`} placeholder="e.g. Barn fridge" aria-invalid={!!errors.name} {...register("name")} />
      </Field>
      <Field label="Kind" htmlFor={`store-kind-${id}`} error={errors.kind?.message}>
        <Select id={`store-kind-${id}`} {...register("kind")}>
          {storeKinds.map((k) => (
            <option key={k} value={k}>
              {vocabularyLabels.storeKind[k]}
            </option>
          ))}
        </Select>
      </Field>
      {kind === "freezer" ? (
        <p className="text-label text-ink-soft">A freezer (about −18 °C) is a different treatment from a fridge, not “more cold”: bags in it lose cold-moist days.</p>
      ) : null}
      <Field label="Boxes and shelves" htmlFor={`store-boxes-${id}`} hint="One per line, e.g. Box A, Top shelf, Crisper." error={errors.boxesText?.message}>
        <TextArea id={`store-boxes-${id}`} rows={3} {...register("boxesText")} />
      </Field>
      <label className="flex min-h-tap items-center gap-3 text-body">
        <input type="checkbox" className="h-6 w-6 accent-glacier-700" {...register("holds_food")} />
        Food is kept in this store too
      </label>
      {holdsFood ? (
        <Caution title="A fridge shared with food">{cautionTexts.foodFridge}</Caution>
      ) : null}
      <Field label="Notes" htmlFor={`store-notes-${id}`} error={errors.notes?.message}>
        <TextArea id={`store-notes-${id}`} rows={2} {...register("notes")} />
      </Field>
      <FormActions error={saveError} submitLabel={store ? "Save changes" : "Add cold store"} busy={isSubmitting} onCancel={() => onDone(null)} />
    </form>
  );
}
