"use client";

import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { useEffect, useRef, useState } from "react";
import { BagPatch, type Bag } from "@/lib/schemas/bag";
import type { Store } from "@/lib/schemas/store";
import { updateBag } from "@/lib/client/repo";
import { Button } from "@/components/ui/Button";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { describeSaveError } from "./save-error";
import { emptyToNull, pickChanged } from "./form-values";
import { MediumOptions } from "./FormBits";

// Edit what can change on a bag in the fridge: where it is and what it sits in, and the note.
const EditFields = BagPatch.pick({ store_id: true, box: true, medium: true, note: true });
type EditIn = z.input<typeof EditFields>;
type EditOut = z.output<typeof EditFields>;

export function BagEditForm({ bag, stores, onDone }: { bag: Bag; stores: readonly Store[]; onDone: () => void }) {
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setValue,
    formState: { errors, isSubmitting, dirtyFields },
  } = useForm<EditIn, unknown, EditOut>({
    resolver: zodResolver(EditFields),
    defaultValues: { store_id: bag.store_id, box: bag.box, medium: bag.medium, note: bag.note },
  });
  const storeId = useWatch({ control, name: "store_id" });
  const store = stores.find((s) => s.id === storeId) ?? null;
  const lastStore = useRef(storeId);
  useEffect(() => {
    if (storeId === lastStore.current) return;
    lastStore.current = storeId;
    setValue("box", stores.find((s) => s.id === storeId)?.boxes[0] ?? null, { shouldDirty: true });
  }, [storeId, stores, setValue]);

  const onSubmit = handleSubmit(async (v) => {
    setError(null);
    // Send only what changed, so an edit never overwrites a field someone else changed meanwhile.
    const patch = pickChanged(v, dirtyFields);
    if (Object.keys(patch).length === 0) return onDone();
    try {
      await updateBag(bag.id, patch);
      onDone();
    } catch (e) {
      setError(describeSaveError(e));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3">
      <Field label="Cold store" htmlFor="edit-store" error={errors.store_id?.message}>
        <Select id="edit-store" {...register("store_id", { setValueAs: emptyToNull })}>
          <option value="">Not in a store</option>
          {stores.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
              {s.holds_food ? " · holds food" : ""}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Box or shelf" htmlFor="edit-box" error={errors.box?.message}>
        {store && store.boxes.length ? (
          <Select id="edit-box" {...register("box", { setValueAs: emptyToNull })}>
            <option value="">No box</option>
            {[...new Set([...store.boxes, ...(bag.box && bag.store_id === store.id ? [bag.box] : [])])].map((b) => (
              <option key={b} value={b}>
                {b}
              </option>
            ))}
          </Select>
        ) : (
          <Input id="edit-box" autoComplete="off" {...register("box", { setValueAs: emptyToNull })} />
        )}
      </Field>
      <Field label="Medium" htmlFor="edit-medium" error={errors.medium?.message}>
        <Select id="edit-medium" {...register("medium")}>
          <MediumOptions />
        </Select>
      </Field>
      <Field label="Note" htmlFor="edit-note" error={errors.note?.message}>
        <TextArea id="edit-note" {...register("note", { setValueAs: emptyToNull })} />
      </Field>
      {error ? (
        <p role="alert" className="text-label text-ember-700">
          {error}
        </p>
      ) : null}
      <div className="flex gap-2">
        <Button type="submit" disabled={isSubmitting}>
          Save changes
        </Button>
        <Button tone="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
