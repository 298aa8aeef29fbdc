"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useState } from "react";
import { useFieldArray, useForm, useWatch, type Control, type FieldErrors, type Resolver, type UseFormRegister } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb, type ProtocolRow } from "@/lib/client/db";
import { Protocol } from "@/lib/schemas/protocol";
import { phaseKinds, vocabularyLabels } from "@/lib/schemas/words";
import { saveProtocol } from "@/lib/client/repo";
import { findToxicSeedFlag } from "@/lib/domain/cautions";
import { describeReconciledPhase, isTimedPhase, reconcileProtocol } from "@/lib/domain/protocols";
import { Button, buttonClass } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { Field, Input, Select, TextArea } from "@/components/ui/Field";
import { useMember } from "@/components/season/use-member";
import { describeSaveError } from "@/components/bags/save-error";
import { blankPhase, blankSource, fromFormValues, toFormValues, type ProtocolFormValues } from "./protocol-form-values";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { numberOrNull } from "@/components/bags/form-values";
import { SaveError } from "@/components/bags/FormBits";

// Edit the farm's own protocol: phases (kind, note) each with sources (citation, min–max days, temperature band),
// validated by the shared Protocol schema after blank number fields are read as "none".

const protocolResolver: Resolver<ProtocolFormValues, unknown, Protocol> = async (values, context, options) => {
  const check = zodResolver(Protocol) as unknown as Resolver<ReturnType<typeof fromFormValues>, unknown, Protocol>;
  return (await check(fromFormValues(values), context, options as never)) as never;
};


export function ProtocolForm() {
  const id = useSearchParams().get("id");
  const row = useLiveQuery(async () => (id ? ((await getLocalDb().protocols.get(id)) ?? null) : null), [id]);
  const { can, identity } = useMember();
  if ((id && row === undefined) || identity === undefined) return <p className="p-4 text-body text-ink-soft">Opening the protocol on this phone…</p>;
  const back = id ? `/protocols/view?id=${encodeURIComponent(id)}` : "/protocols";
  let body: React.ReactNode;
  if (!can("protocol.upsert")) body = <p className="text-body">Your role on this farm cannot change protocols. Ask a grower or the owner.</p>;
  else if (id && (!row || row.deleted_at)) body = <p className="text-body">This protocol is not on this phone.</p>;
  else if (row && !row.is_farm_own)
    body = (
      <div className="space-y-3">
        <p className="text-body">This row shows a published source as printed. Copy it to the farm&apos;s own first; the copy is yours to change.</p>
        <Link href={back} className={buttonClass("primary", "md")}>
          Back to copy it
        </Link>
      </div>
    );
  else return <ProtocolFormBody key={row?.id ?? "new"} row={row ?? null} back={back} />;
  return (
    <div className="mx-auto max-w-xl px-4 pb-28 pt-4">
      <PageHeader title="Protocol" />
      <Card>{body}</Card>
    </div>
  );
}

function ProtocolFormBody({ row, back }: { row: ProtocolRow | null; back: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<ProtocolFormValues, unknown, Protocol>({
    resolver: protocolResolver,
    defaultValues: row
      ? toFormValues(readProtocolRow(row))
      : toFormValues({ species: "", commonName: "", phases: [], effectiveBand: null, noColdReason: "", toxicSeed: null, medicinal: false, note: "" }),
  });
  const phases = useFieldArray({ control, name: "phases" });
  const watched = useWatch({ control }) as ProtocolFormValues;

  const onSubmit = handleSubmit(async (p) => {
    setError(null);
    try {
      const id = row?.id ?? crypto.randomUUID();
      // A species the genus list knows as toxic keeps its flag, so the cautions follow the copy.
      const toxicSeed = p.toxicSeed ?? findToxicSeedFlag(p.species)?.flag ?? null;
      await saveProtocol({ ...p, toxicSeed, isFarmOwn: true, id, starter_key: null, source_trial_id: row?.source_trial_id ?? null });
      router.push(`/protocols/view?id=${encodeURIComponent(id)}`);
    } catch (e) {
      setError(describeSaveError(e));
    }
  });

  // A live preview from lib/domain of what the phases add up to (only when the numbers parse).
  const preview = (() => {
    const parsed = Protocol.safeParse(fromFormValues(watched));
    return parsed.success ? reconcileProtocol(parsed.data) : null;
  })();

  return (
    <div className="mx-auto max-w-xl px-4 pb-28 pt-4">
      <Link href={back} className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← Back
      </Link>
      <PageHeader title={row ? "Edit the farm's protocol" : "New protocol"} subtitle="The farm's own numbers, each with its source" />
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <Card className="space-y-4">
          <Field label="Species (botanical name)" htmlFor="species" error={errors.species?.message}>
            <Input id="species" autoComplete="off" aria-invalid={!!errors.species} {...register("species")} />
          </Field>
          <Field label="Common name" htmlFor="commonName" error={errors.commonName?.message}>
            <Input id="commonName" autoComplete="off" {...register("commonName")} />
          </Field>
        </Card>

        {phases.fields.map((f, i) => (
          <PhaseEditor key={f.id} index={i} control={control} register={register} errors={errors} onRemove={() => phases.remove(i)} onMove={(to) => phases.move(i, to)} count={phases.fields.length} />
        ))}
        {errors.phases?.message ? <p className="text-label text-ember-700">{errors.phases.message}</p> : null}
        <div className="flex flex-wrap gap-2">
          <Button tone="secondary" onClick={() => phases.append(blankPhase("cold_moist"))}>
            + Cold-moist phase
          </Button>
          <Button tone="quiet" onClick={() => phases.append(blankPhase("warm_moist"))}>
            + Warm-moist phase
          </Button>
          <Button tone="quiet" onClick={() => phases.append({ ...blankPhase("scarify"), sources: [] })}>
            + Other step
          </Button>
        </div>

        <Card className="space-y-4">
          <fieldset className="space-y-2">
            <legend className="text-label font-semibold">Temperatures that count as cold (°C)</legend>
            <p className="text-label text-ink-soft">Leave blank for Rimebook&apos;s default, 0 to 10 °C.</p>
            <div className="grid grid-cols-2 gap-3">
              <Field label="Lowest" htmlFor="band-min" error={errors.effectiveBand?.minC?.message}>
                <Input id="band-min" type="number" inputMode="decimal" step="0.5" {...register("effectiveBand.minC", { setValueAs: numberOrNull })} />
              </Field>
              <Field label="Highest" htmlFor="band-max" error={errors.effectiveBand?.maxC?.message}>
                <Input id="band-max" type="number" inputMode="decimal" step="0.5" {...register("effectiveBand.maxC", { setValueAs: numberOrNull })} />
              </Field>
            </div>
          </fieldset>
          <Field label="If it needs no cold: why" htmlFor="noColdReason" error={errors.noColdReason?.message} hint="For example: sow directly; after-ripens in dry storage.">
            <Input id="noColdReason" {...register("noColdReason")} />
          </Field>
          <label className="flex min-h-tap items-center gap-3">
            <input type="checkbox" className="h-6 w-6" {...register("medicinal")} />
            <span className="text-body">Medicinal plant (growing information only)</span>
          </label>
          {watched.medicinal ? <Caution title="Medicinal plant">{cautionTexts.medicinal}</Caution> : null}
          {watched.toxicSeed || findToxicSeedFlag(watched.species ?? "") ? <Caution title="Toxic seed">{cautionTexts.toxic}</Caution> : null}
          <Field label="Note" htmlFor="note" error={errors.note?.message}>
            <TextArea id="note" {...register("note")} />
          </Field>
        </Card>

        {preview && preview.phases.length ? (
          <Card className="space-y-1" aria-live="polite">
            <h2 className="text-label font-semibold">What this adds up to</h2>
            <ul className="text-label">
              {preview.phases.map((ph, i) => (
                <li key={i}>{describeReconciledPhase(ph, vocabularyLabels.phaseKind[ph.kind])}</li>
              ))}
            </ul>
          </Card>
        ) : null}

        <SaveError message={error} />
        {Object.keys(errors).length ? (
          <p role="alert" className="text-label font-semibold text-ember-700">
            Some fields need another look (marked in red).
          </p>
        ) : null}
        <Button type="submit" size="lg" className="w-full" disabled={isSubmitting}>
          Save the farm&apos;s protocol
        </Button>
      </form>
    </div>
  );
}

function PhaseEditor({
  index,
  control,
  register,
  errors,
  onRemove,
  onMove,
  count,
}: {
  index: number;
  control: Control<ProtocolFormValues, unknown, Protocol>;
  register: UseFormRegister<ProtocolFormValues>;
  errors: FieldErrors<ProtocolFormValues>;
  onRemove: () => void;
  onMove: (to: number) => void;
  count: number;
}) {
  const sources = useFieldArray({ control, name: `phases.${index}.sources` });
  const kind = useWatch({ control, name: `phases.${index}.kind` });
  const timed = isTimedPhase(kind);
  const pe = errors.phases?.[index];
  const base = `phase-${index}`;
  return (
    <Card className="space-y-3">
      <div className="flex items-end gap-2">
        <div className="flex-1">
          <Field label={`Phase ${index + 1}`} htmlFor={`${base}-kind`} error={pe?.kind?.message}>
            <Select id={`${base}-kind`} {...register(`phases.${index}.kind`)}>
              {phaseKinds.map((k) => (
                <option key={k} value={k}>
                  {vocabularyLabels.phaseKind[k]}
                </option>
              ))}
            </Select>
          </Field>
        </div>
        <Button tone="quiet" aria-label={`Move phase ${index + 1} earlier`} disabled={index === 0} onClick={() => onMove(index - 1)}>
          ↑
        </Button>
        <Button tone="quiet" aria-label={`Move phase ${index + 1} later`} disabled={index === count - 1} onClick={() => onMove(index + 1)}>
          ↓
        </Button>
      </div>
      <Field label="Phase note" htmlFor={`${base}-note`} error={pe?.note?.message}>
        <Input id={`${base}-note`} {...register(`phases.${index}.note`)} />
      </Field>

      <p className="text-label font-semibold">Sources</p>
      {sources.fields.map((s, j) => {
        const se = pe?.sources?.[j];
        const sb = `${base}-src-${j}`;
        return (
          <fieldset key={s.id} className="space-y-3 rounded-xl border-2 border-rime-200 p-3">
            <legend className="px-1 text-label font-semibold">Source {j + 1}</legend>
            <Field label="Citation" htmlFor={`${sb}-cite`} error={se?.citation?.message} hint="Book, paper, supplier, or the farm's own records.">
              <Input id={`${sb}-cite`} aria-invalid={!!se?.citation} {...register(`phases.${index}.sources.${j}.citation`)} />
            </Field>
            {timed ? (
              <>
                <div className="grid grid-cols-2 gap-3">
                  <Field label="Shortest (days)" htmlFor={`${sb}-min`} error={se?.minDays?.message}>
                    <Input id={`${sb}-min`} type="number" inputMode="numeric" min={0} aria-invalid={!!se?.minDays} {...register(`phases.${index}.sources.${j}.minDays`, { setValueAs: numberOrNull })} />
                  </Field>
                  <Field label="Longest (days)" htmlFor={`${sb}-max`} error={se?.maxDays?.message} hint="Blank: no upper limit.">
                    <Input id={`${sb}-max`} type="number" inputMode="numeric" min={0} aria-invalid={!!se?.maxDays} {...register(`phases.${index}.sources.${j}.maxDays`, { setValueAs: numberOrNull })} />
                  </Field>
                </div>
                <div className="grid grid-cols-2 gap-3">
                  <Field label="From °C" htmlFor={`${sb}-bmin`} error={se?.band?.minC?.message}>
                    <Input id={`${sb}-bmin`} type="number" inputMode="decimal" step="0.5" {...register(`phases.${index}.sources.${j}.band.minC`, { setValueAs: numberOrNull })} />
                  </Field>
                  <Field label="To °C" htmlFor={`${sb}-bmax`} error={se?.band?.maxC?.message} hint="One value: that temperature.">
                    <Input id={`${sb}-bmax`} type="number" inputMode="decimal" step="0.5" {...register(`phases.${index}.sources.${j}.band.maxC`, { setValueAs: numberOrNull })} />
                  </Field>
                </div>
              </>
            ) : null}
            <Field label="What the source says" htmlFor={`${sb}-note`} error={se?.note?.message}>
              <Input id={`${sb}-note`} {...register(`phases.${index}.sources.${j}.note`)} />
            </Field>
            <Button tone="quiet" onClick={() => sources.remove(j)}>
              Remove source {j + 1}
            </Button>
          </fieldset>
        );
      })}
      {pe?.sources?.message ? (
        <p role="alert" className="text-label text-ember-700">
          {pe.sources.message}
        </p>
      ) : null}
      {pe?.sources?.root?.message ? <p className="text-label text-ember-700">{pe.sources.root.message}</p> : null}
      <div className="flex flex-wrap gap-2">
        <Button tone="secondary" onClick={() => sources.append(blankSource())}>
          + Source
        </Button>
        <Button tone="quiet" className="text-ember-700" onClick={onRemove}>
          Remove phase {index + 1}
        </Button>
      </div>
    </Card>
  );
}
