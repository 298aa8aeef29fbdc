"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { LotInput, type Lot } from "@/lib/schemas/lot";
import { createLot, updateLot } from "@/lib/client/repo";
import type { ProtocolRow } from "@/lib/client/db";
import { Button, buttonClass } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { useMember } from "@/components/season/use-member";
import { useBagSources } from "@/components/bags/use-farm-rows";
import { describeSaveError } from "@/components/bags/save-error";
import { matchProtocolBySpecies } from "@/lib/domain/rows/protocol-row";
import { emptyToNull, numberOrNull, pickChanged } from "@/components/bags/form-values";
import { SaveError } from "@/components/bags/FormBits";
import { FarmHistoryPanel } from "@/components/learn/FarmHistoryPanel";

// Add or edit a seed lot with the shared Lot schema (the id is made on the phone for a new lot).
const LotFields = LotInput.omit({ id: true });
type LotIn = z.input<typeof LotFields>;
type LotOut = z.output<typeof LotFields>;


export function LotForm() {
  const id = useSearchParams().get("id");
  const sources = useBagSources();
  const { can, identity } = useMember();
  if (!sources || identity === undefined) return <p className="p-4 text-body text-ink-soft">Opening the seed lots on this phone…</p>;
  const lot = id ? (sources.lots.find((l) => l.id === id) ?? null) : null;
  const allowed = can(lot ? "lot.update" : "lot.create");
  return (
    <div className="mx-auto max-w-xl px-4 pb-28 pt-4">
      <Link href="/lots" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← All seed lots
      </Link>
      <PageHeader title={lot ? "Edit seed lot" : "New seed lot"} />
      {id && !lot ? (
        <Card>
          <p className="text-body">This lot is not on this phone. It may have been removed, or the phone has not synced it yet.</p>
        </Card>
      ) : !allowed ? (
        <Card>
          <p className="text-body">Your role on this farm cannot change seed lots. Ask a grower or the owner.</p>
        </Card>
      ) : (
        <LotFormBody key={lot?.id ?? "new"} lot={lot} protocols={sources.protocols} />
      )}
      {lot ? (
        <div className="mt-4">
          <FarmHistoryPanel species={lot.species} protocol={sources.protocols.find((p) => p.id === lot.protocol_id && !p.deleted_at) ?? null} lotId={lot.id} />
        </div>
      ) : null}
    </div>
  );
}

function LotFormBody({ lot, protocols }: { lot: Lot | null; protocols: readonly ProtocolRow[] }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setValue,
    formState: { errors, isSubmitting, dirtyFields },
  } = useForm<LotIn, unknown, LotOut>({
    resolver: zodResolver(LotFields),
    defaultValues: lot
      ? { species: lot.species, common_name: lot.common_name, source: lot.source, year: lot.year, quantity: lot.quantity, protocol_id: lot.protocol_id, treated: lot.treated, notes: lot.notes }
      : { species: "", common_name: null, source: null, year: new Date().getFullYear(), quantity: null, protocol_id: null, treated: false, notes: null },
  });
  const [species, treated] = useWatch({ control, name: ["species", "treated"] });

  // For a new lot, typing a species that has a protocol picks it (the grower can change it).
  const touchedProtocol = useRef(Boolean(lot));
  useEffect(() => {
    if (touchedProtocol.current || !species) return;
    setValue("protocol_id", matchProtocolBySpecies(species, protocols)?.id ?? null);
  }, [species, protocols, setValue]);

  const onSubmit = handleSubmit(async (v) => {
    setError(null);
    try {
      if (lot) {
        const patch = pickChanged(v, dirtyFields);
        if (Object.keys(patch).length) await updateLot(lot.id, patch);
      } else {
        await createLot(v);
      }
      router.push("/lots");
    } catch (e) {
      setError(describeSaveError(e));
    }
  });
  const err = (k: keyof LotIn) => errors[k]?.message as string | undefined;
  const protocolRegistration = register("protocol_id", { setValueAs: emptyToNull });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <Card className="space-y-4">
        <Field label="Species (botanical name)" htmlFor="species" error={err("species")} hint="For example Asclepias syriaca; the protocol is matched by this name.">
          <Input id="species" autoComplete="off" aria-invalid={!!errors.species} {...register("species")} />
        </Field>
        <Field label="Common name" htmlFor="common_name" error={err("common_name")}>
          <Input id="common_name" autoComplete="off" {...register("common_name", { setValueAs: emptyToNull })} />
        </Field>
        <Field label="Source" htmlFor="source" error={err("source")} hint="Supplier, collection site or seed library.">
          <Input id="source" autoComplete="off" {...register("source", { setValueAs: emptyToNull })} />
        </Field>
        <div className="grid grid-cols-2 gap-3">
          <Field label="Year" htmlFor="year" error={err("year")}>
            <Input id="year" type="number" inputMode="numeric" aria-invalid={!!errors.year} {...register("year", { setValueAs: numberOrNull })} />
          </Field>
          <Field label="Seeds in the lot" htmlFor="quantity" error={err("quantity")}>
            <Input id="quantity" type="number" inputMode="numeric" min={0} aria-invalid={!!errors.quantity} {...register("quantity", { setValueAs: numberOrNull })} />
          </Field>
        </div>
        <Field label="Protocol" htmlFor="protocol_id" error={err("protocol_id")}>
          <Select
            id="protocol_id"
            {...protocolRegistration}
            onChange={(e) => {
              touchedProtocol.current = true;
              return protocolRegistration.onChange(e);
            }}
          >
            <option value="">No protocol yet</option>
            {protocols.map((p) => (
              <option key={p.id} value={p.id}>
                {p.species}
                {p.common_name ? ` (${p.common_name})` : ""}
                {p.is_farm_own ? " · farm's own" : " · published source"}
              </option>
            ))}
          </Select>
        </Field>
        <label className="flex min-h-tap items-center gap-3 rounded-xl border-2 border-rime-300 px-3 has-[:checked]:border-ember-600">
          <input type="checkbox" className="h-6 w-6" {...register("treated")} />
          <span className="text-body">Treated seed (coated with a fungicide or other chemical)</span>
        </label>
        {treated ? (
          <Caution title="Treated seed" tone="strong">
            {cautionTexts.treated}
          </Caution>
        ) : null}
        <Field label="Notes" htmlFor="notes" error={err("notes")}>
          <TextArea id="notes" {...register("notes", { setValueAs: emptyToNull })} />
        </Field>
      </Card>
      <SaveError message={error} />
      <div className="flex gap-2">
        <Button type="submit" size="lg" className="flex-1" disabled={isSubmitting}>
          {lot ? "Save changes" : "Save lot"}
        </Button>
        <Link href="/lots" className={buttonClass("quiet", "lg")}>
          Cancel
        </Link>
      </div>
    </form>
  );
}
