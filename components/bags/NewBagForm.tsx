"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useEffect, useMemo, useRef, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { BagInput } from "@/lib/schemas/bag";
import { vocabularyLabels } from "@/lib/schemas/words";
import { createBag } from "@/lib/client/repo";
import { useOnline, useRecordSync } from "@/lib/client/hooks";
import { savedWhereWords } from "@/components/shell/sync-words";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { reconcileProtocol } from "@/lib/domain/protocols";
import type { Lot } from "@/lib/schemas/lot";
import { Button, buttonClass } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import type { BagRowSources } from "@/lib/domain/rows/bag-rows";
import { buildNewBagDraft, fillPullWindow, generateUniqueBagCode, pickProtocolForLot } from "./new-bag-defaults";
import { BagCautions } from "./BagCautions";
import { pickBagCautions } from "@/components/check/bag-cautions";
import { useMember } from "@/components/season/use-member";
import { formatLongDay } from "./format-day";
import { describeSaveError } from "./save-error";
import { useBagSources, useToday } from "./use-farm-rows";
import { sortLots } from "@/components/lots/lot-use";
import { emptyToNull, numberOrNull } from "./form-values";
import { SaveError, MediumOptions } from "./FormBits";

// The bag form uses the shared Bag schema (BagInput), with one extra choice: does the bag go in today or later.
const NewBagFields = BagInput.pick({
  code: true,
  lot_id: true,
  protocol_id: true,
  store_id: true,
  box: true,
  medium: true,
  seed_count: true,
  start_date: true,
  planned_start_date: true,
  window_start: true,
  window_end: true,
  note: true,
})
  .extend({ when: z.enum(["now", "planned"]), lot_id: z.uuid({ error: "Choose the seed lot this bag comes from." }) })
  .superRefine((v, ctx) => {
    if (v.when === "now" && !v.start_date) ctx.addIssue({ code: "custom", path: ["start_date"], message: "Give the day the bag went in." });
    if (v.when === "planned" && !v.planned_start_date)
      ctx.addIssue({ code: "custom", path: ["planned_start_date"], message: "Give the day you plan to put the bag in." });
    if (v.window_start && v.window_end && v.window_end < v.window_start)
      ctx.addIssue({ code: "custom", path: ["window_end"], message: "The latest pull day must not be before the earliest." });
  });
type FormIn = z.input<typeof NewBagFields>;
type FormOut = z.output<typeof NewBagFields>;


function randomBytes() {
  return crypto.getRandomValues(new Uint8Array(8));
}

function lotLabel(l: Lot) {
  return [l.species, l.common_name ? `(${l.common_name})` : "", l.source ? `— ${l.source}` : "", l.year ? String(l.year) : ""].filter(Boolean).join(" ");
}

export function NewBagForm() {
  const sources = useBagSources();
  const today = useToday();
  const canCreate = useMember().can("bag.create");
  const params = useSearchParams();
  if (!sources) return <p className="p-4 text-body text-ink-soft">Opening the lots and stores on this phone…</p>;
  return (
    <div className="mx-auto max-w-xl px-4 pb-28 pt-4">
      <PageHeader title="New bag" subtitle="From a seed lot and its protocol" />
      {!canCreate ? (
        <Card>
          <p className="text-body">Your role on this farm can record checks but not set up bags. Ask a grower or the owner.</p>
        </Card>
      ) : sources.lots.length === 0 ? (
        <Card className="space-y-3">
          <p className="text-body">A bag starts from a seed lot, and this farm has none yet.</p>
          <Link href="/lots/edit" className={buttonClass("primary", "md")}>
            Add a seed lot
          </Link>
        </Card>
      ) : (
        <NewBagFormBody sources={sources} today={today} initialLotId={params.get("lot")} />
      )}
    </div>
  );
}

function NewBagFormBody({ sources, today, initialLotId }: { sources: BagRowSources; today: string; initialLotId: string | null }) {
  const router = useRouter();
  const [saved, setSaved] = useState<{ id: string; code: string } | null>(null);
  const savedWhere = useRecordSync("bag.create", saved?.id);
  const online = useOnline();
  const [saveError, setSaveError] = useState<string | null>(null);
  const existingCodes = useMemo(() => sources.bags.map((b) => b.code), [sources.bags]);
  const initialLot = sources.lots.find((l) => l.id === initialLotId) ?? null;

  const defaults = useMemo((): FormIn => {
    const draft = buildNewBagDraft({ lot: initialLot, protocols: sources.protocols, stores: sources.stores, today, when: "now" });
    return { ...draft, lot_id: draft.lot_id ?? "", code: generateUniqueBagCode(existingCodes, randomBytes), seed_count: null, note: null, when: "now" };
    // Defaults are taken once, when the form opens.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const {
    register,
    handleSubmit,
    setValue,
    control,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({ resolver: zodResolver(NewBagFields), defaultValues: defaults });

  const [lotId, protocolId, when, startDate, plannedStart, storeId, windowStart, windowEnd, code] = useWatch({
    control,
    name: ["lot_id", "protocol_id", "when", "start_date", "planned_start_date", "store_id", "window_start", "window_end", "code"],
  });
  const lot = sources.lots.find((l) => l.id === lotId) ?? null;
  const protocol = sources.protocols.find((p) => p.id === protocolId) ?? null;
  const store = sources.stores.find((s) => s.id === storeId) ?? null;

  // Choosing the lot fills its protocol (only on a change, so the opening defaults stay).
  const lastLot = useRef(lotId);
  useEffect(() => {
    if (lotId === lastLot.current) return;
    lastLot.current = lotId;
    const chosen = sources.lots.find((l) => l.id === lotId);
    if (chosen) setValue("protocol_id", pickProtocolForLot(chosen, sources.protocols)?.id ?? null);
  }, [lotId, sources, setValue]);
  // The window follows the protocol and the day the bag goes in (left alone when there is no protocol: the grower types it).
  const countFrom = when === "now" ? startDate : plannedStart;
  useEffect(() => {
    if (!protocol) return;
    const w = fillPullWindow(protocol, countFrom ?? null);
    setValue("window_start", w.window_start);
    setValue("window_end", w.window_end);
  }, [protocol, countFrom, setValue]);
  // A new store offers its first box.
  const lastStore = useRef(storeId);
  useEffect(() => {
    if (storeId === lastStore.current) return;
    lastStore.current = storeId;
    setValue("box", sources.stores.find((s) => s.id === storeId)?.boxes[0] ?? null);
  }, [storeId, sources, setValue]);

  const reconciled = protocol ? readProtocolRow(protocol) : null;
  const cautions = pickBagCautions({
    species: lot?.species ?? protocol?.species ?? "",
    toxicSeed: protocol?.toxic_seed ?? null,
    treated: lot?.treated,
    medicinal: protocol?.medicinal,
    storeHoldsFood: store?.holds_food,
  });

  const onSubmit = handleSubmit(async (v) => {
    setSaveError(null);
    try {
      const { when: w, ...bag } = v;
      const saved = await createBag({
        ...bag,
        start_date: w === "now" ? bag.start_date : null,
        planned_start_date: w === "planned" ? bag.planned_start_date : null,
      });
      setSaved({ id: saved.id, code: saved.code });
    } catch (e) {
      setSaveError(describeSaveError(e));
    }
  });

  if (saved) {
    return (
      <Card className="space-y-4" aria-live="polite">
        <p className="text-title font-bold text-moss-700">
          <span aria-hidden="true">✓ </span>Bag {formatBagCode(saved.code)} saved {savedWhere === "sent" ? "on the farm" : "on this phone"}
        </p>
        <p className="text-body text-ink-soft" data-testid="saved-where">
          {savedWhereWords(savedWhere, online)} Print its label before it goes in the fridge.
        </p>
        <div className="flex flex-col gap-2">
          <Link href={`/labels?ids=${encodeURIComponent(saved.id)}`} className={buttonClass("primary", "lg")}>
            Print label
          </Link>
          <Link href={`/bags/view?id=${encodeURIComponent(saved.id)}`} className={buttonClass("secondary", "md")}>
            Open the bag
          </Link>
          <Button
            tone="quiet"
            onClick={() => {
              reset({ ...defaults, lot_id: lotId, protocol_id: protocolId, store_id: storeId, code: generateUniqueBagCode([...existingCodes, saved.code], randomBytes) });
              setSaved(null);
            }}
          >
            Another bag from this lot
          </Button>
          <Button tone="quiet" onClick={() => router.push("/bags")}>
            Back to bags
          </Button>
        </div>
      </Card>
    );
  }

  const err = (k: keyof FormIn) => (errors[k]?.message as string | undefined) ?? undefined;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <Card className="space-y-4">
        <Field label="Seed lot" htmlFor="lot_id" error={err("lot_id")}>
          <Select id="lot_id" aria-invalid={!!errors.lot_id} {...register("lot_id")}>
            <option value="">Choose a lot…</option>
            {sortLots(sources.lots).map((l) => (
              <option key={l.id} value={l.id}>
                {lotLabel(l)}
              </option>
            ))}
          </Select>
        </Field>
        <Field
          label="Protocol"
          htmlFor="protocol_id"
          error={err("protocol_id")}
          hint={protocol ? (protocol.is_farm_own ? "The farm's own protocol." : "A published source; copy it to make it the farm's own.") : "Without a protocol, type the pull window yourself."}
        >
          <Select id="protocol_id" {...register("protocol_id", { setValueAs: emptyToNull })}>
            <option value="">No protocol</option>
            {sources.protocols.map((p) => (
              <option key={p.id} value={p.id}>
                {p.species}
                {p.common_name ? ` (${p.common_name})` : ""}
                {p.is_farm_own ? " · farm's own" : ""}
              </option>
            ))}
          </Select>
        </Field>
        {reconciled?.noColdReason ? <p className="text-label text-wheat-700">{reconciled.noColdReason}</p> : null}
      </Card>

      <Card className="space-y-4">
        <fieldset className="space-y-2">
          <legend className="text-label font-semibold">When does it go in?</legend>
          <div className="grid grid-cols-2 gap-2">
            <label className="flex min-h-tap items-center gap-2 rounded-xl border-2 border-rime-300 px-3 has-[:checked]:border-glacier-700 has-[:checked]:bg-rime-100">
              <input type="radio" value="now" className="h-5 w-5" {...register("when")} /> Today or earlier
            </label>
            <label className="flex min-h-tap items-center gap-2 rounded-xl border-2 border-rime-300 px-3 has-[:checked]:border-glacier-700 has-[:checked]:bg-rime-100">
              <input type="radio" value="planned" className="h-5 w-5" {...register("when")} /> Planned
            </label>
          </div>
        </fieldset>
        {when === "now" ? (
          <Field label="Start date" htmlFor="start_date" error={err("start_date")}>
            <Input id="start_date" type="date" max={today} aria-invalid={!!errors.start_date} {...register("start_date", { setValueAs: emptyToNull })} />
          </Field>
        ) : (
          <Field label="Planned start date" htmlFor="planned_start_date" error={err("planned_start_date")}>
            <Input id="planned_start_date" type="date" aria-invalid={!!errors.planned_start_date} {...register("planned_start_date", { setValueAs: emptyToNull })} />
          </Field>
        )}
        {protocol ? (
          <div className="rounded-xl bg-rime-100 p-3" aria-live="polite">
            <p className="text-label font-semibold">Pull window {when === "planned" ? "if it goes in on the planned day" : ""}</p>
            {windowStart ? (
              <p className="text-body">
                {formatLongDay(windowStart)} – {windowEnd ? formatLongDay(windowEnd) : "when the first roots show (no latest day)"}
              </p>
            ) : (
              <p className="text-body text-ink-soft">No window: this protocol needs no timed cold.</p>
            )}
            {reconciled && reconcileProtocol(reconciled).sourcesDisagree ? (
              <p className="mt-1 text-label text-ink-soft">
                Sources disagree: the window opens on the earliest day; check daily from then and pull when the first roots show (common practice).
              </p>
            ) : null}
          </div>
        ) : (
          <div className="grid grid-cols-2 gap-3">
            <Field label="Earliest pull" htmlFor="window_start" error={err("window_start")}>
              <Input id="window_start" type="date" {...register("window_start", { setValueAs: emptyToNull })} />
            </Field>
            <Field label="Latest pull" htmlFor="window_end" error={err("window_end")}>
              <Input id="window_end" type="date" aria-invalid={!!errors.window_end} {...register("window_end", { setValueAs: emptyToNull })} />
            </Field>
          </div>
        )}
      </Card>

      <Card className="space-y-4">
        <Field label="Cold store" htmlFor="store_id" error={err("store_id")}>
          <Select id="store_id" {...register("store_id", { setValueAs: emptyToNull })}>
            <option value="">Not in a store yet</option>
            {sources.stores.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name} · {vocabularyLabels.storeKind[s.kind]}
                {s.holds_food ? " · holds food" : ""}
              </option>
            ))}
          </Select>
        </Field>
        {store && store.boxes.length ? (
          <Field label="Box or shelf" htmlFor="box" error={err("box")}>
            <Select id="box" {...register("box", { setValueAs: emptyToNull })}>
              <option value="">No box</option>
              {store.boxes.map((b) => (
                <option key={b} value={b}>
                  {b}
                </option>
              ))}
            </Select>
          </Field>
        ) : (
          <Field label="Box or shelf" htmlFor="box" error={err("box")}>
            <Input id="box" autoComplete="off" {...register("box", { setValueAs: emptyToNull })} />
          </Field>
        )}
        {store?.kind === "freezer" ? (
          <p className="text-label text-glacier-800">A freezer is a different treatment from a fridge, not more cold: count only the protocol's frozen phase here.</p>
        ) : null}
        <div className="grid grid-cols-2 gap-3">
          <Field label="Medium" htmlFor="medium" error={err("medium")}>
            <Select id="medium" {...register("medium")}>
              <MediumOptions />
            </Select>
          </Field>
          <Field label="Seeds in the bag" htmlFor="seed_count" error={err("seed_count")}>
            <Input id="seed_count" type="number" inputMode="numeric" min={1} aria-invalid={!!errors.seed_count} {...register("seed_count", { setValueAs: numberOrNull })} />
          </Field>
        </div>
        <Field label="Note" htmlFor="note" error={err("note")}>
          <TextArea id="note" {...register("note", { setValueAs: emptyToNull })} />
        </Field>
      </Card>

      <Card className="space-y-2">
        <p className="text-label font-semibold">Bag code for the label</p>
        <p className="font-mono text-code font-bold tracking-widest text-glacier-800" aria-live="polite">
          {code ? formatBagCode(code) : "—"}
        </p>
        <p className="text-label text-ink-soft">The last character is a check: a mistyped code is caught when someone types it in.</p>
        <Button tone="quiet" onClick={() => setValue("code", generateUniqueBagCode(existingCodes, randomBytes))}>
          Make another code
        </Button>
        {errors.code ? <p className="text-label text-ember-700">{errors.code.message}</p> : null}
      </Card>

      <BagCautions cautions={cautions} />

      <SaveError message={saveError} />
      <Button type="submit" size="lg" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? "Saving…" : "Save bag"}
      </Button>
    </form>
  );
}

