"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useEffect, useMemo, useRef, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { useFarmRoots } from "@/components/learn/use-farm-roots";
import { getLocalDb } from "@/lib/client/db";
import { loadFarmFetched } from "@/lib/client/meta";
import { loadIdentity } from "@/lib/client/identity";
import { lazyModule, useLazyModule } from "@/lib/client/lazy-module";
import { formatBagCode, parseBagCode } from "@/lib/domain/bag-codes";
import { formatIsoDay } from "@/lib/domain/dates";
import type { TemperatureUnit } from "@/lib/domain/units";
import { AppError } from "@/lib/errors";
import { canRun } from "@/lib/schemas/roles";
import { vocabularyLabels } from "@/lib/schemas/words";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { SheetCautions } from "./SheetCautions";
import { StateBadge } from "@/components/ui/StateBadge";
import { formatShortDay } from "@/components/bags/format-day";
import { chooseSheetSteps, sheetStepLabels, type SheetChoice, type SheetStep } from "@/lib/domain/check-choice";
import { DiscardPanel, PullPanel } from "@/components/bags/EndBagPanels";
import { allGoodDraft, isDraftEntered, markAllGood, spreadingMouldReason, type CheckDraft, type CheckEnd } from "./check-draft";
import type { CheckSavePlan } from "./check-save";
import type { CheckFormHandle } from "./CheckDetails";

// Needed only after a tap, so kept out of the sheet's first load (a grower opens it from a label on a weak
// phone): the save's schema checks (zod), the repositories, photo compression and the photo queue. The service
// worker precaches these chunks with the rest, so they load with no signal; the save's are warmed once the sheet shows.
const loadSave = () => import("./check-save");
const loadRepo = () => import("@/lib/client/repo");
const loadPhotoTools = () => Promise.all([import("./compress-photo"), import("@/lib/client/photos")]);
// Needed once the bag is read, so fetched beside hydration rather than in the first load: the bag's window and
// state (the round's computations) and the details form (react-hook-form). "All good" needs neither form nor schema.
const sheetView = lazyModule(() => import("./sheet-view"));
const detailsForm = lazyModule(() => import("./CheckDetails"));

// The check sheet: one tap for "all good", or the findings, actions, note, temperature and a photo.
// Saved on the phone through the repositories (outbox), so it works with no signal.

type Photo = { blob: Blob; url: string };

export function CheckSheet() {
  const params = useSearchParams();
  const router = useRouter();
  const bagId = params.get("bag");
  const code = params.get("code");
  const from = params.get("from");
  const today = formatIsoDay(new Date());

  const tools = useLazyModule(sheetView);
  const Details = useLazyModule(detailsForm)?.CheckDetails;
  const data = useLiveQuery(async () => {
    if (!tools) return undefined; // "Opening the bag…" until the bag's window can be worked out
    const db = getLocalDb();
    const [sheet, identity, fetched] = await Promise.all([tools.loadBagForSheet(db, { bagId, code }), loadIdentity(db), loadFarmFetched(db)]);
    return { sheet, identity, fetched };
  }, [bagId, code, tools]);
  // Cold lost up to now moves the window, as on Today (the live query re-runs when the store's readings change).
  const view = useMemo(() => (data?.sheet && tools ? tools.describeSheet(data.sheet, today, { asOf: Date.now() }) : null), [data?.sheet, today, tools]);

  // Fetch the save's schema checks once the sheet is open, so the first tap does not wait for them.
  useEffect(() => {
    const t = setTimeout(() => void Promise.all([loadSave(), loadRepo()]).catch(() => undefined), 300);
    return () => clearTimeout(t);
  }, []);

  const farmRoots = useFarmRoots(data?.sheet?.lot?.species, data?.sheet?.bag.start_date ?? null);
  const unit: TemperatureUnit = data?.identity?.farm.temperature_unit === "F" ? "F" : "C";
  const role = data?.identity?.role;
  const mayRecord = role ? canRun(role, "check.record") : false;

  const [saving, setSaving] = useState(false);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [photo, setPhoto] = useState<Photo | null>(null);
  const [photoNote, setPhotoNote] = useState<string | null>(null);
  const [ending, setEnding] = useState<"pull" | "discard" | null>(null);

  // What is entered lives in the details form (react-hook-form, loaded beside hydration); until it is there the
  // draft is "all good", which is what the one-tap step saves.
  const [draft, setDraft] = useState<CheckDraft>(allGoodDraft);
  const formRef = useRef<CheckFormHandle | null>(null);
  const valuesNow = () => formRef.current?.getValues() ?? draft;

  if (data === undefined) return <p className="text-ink-soft">Opening the bag…</p>;
  if (!data.identity) {
    const back = `/check?${params.toString()}`;
    return (
      <Card role="alert" className="space-y-3">
        <p className="font-semibold">Sign in to open this bag.</p>
        <p className="text-label text-ink-soft">Rimebook keeps your farm on this phone after the first sign-in, so labels open even with no signal.</p>
        <Link href={`/sign-in?next=${encodeURIComponent(back)}`} className="font-semibold text-glacier-700 underline">
          Sign in
        </Link>
      </Card>
    );
  }
  if (!data.sheet && !data.fetched) {
    return (
      <Card role="status" className="space-y-2">
        <p className="font-semibold">Fetching your farm onto this phone…</p>
        <p className="text-label text-ink-soft">This needs signal once; afterwards bags open with no signal.</p>
      </Card>
    );
  }
  if (!data.sheet || !view) {
    const shown = code ? formatBagCode(code) : null;
    const parsed = code ? parseBagCode(code) : null;
    return (
      <Card role="alert" className="space-y-3">
        <p className="font-semibold">
          {parsed && !parsed.ok ? `The code ${code} cannot be read. ${parsed.message}` : shown ? `No bag with code ${shown} on this farm.` : "This bag is not on this phone."}
        </p>
        <p className="text-label text-ink-soft">
          If the bag was added on another phone moments ago, connect once so this phone can fetch it. A label from another farm cannot be opened here.
        </p>
        <Link href="/scan" className="font-semibold text-glacier-700 underline">
          Back to the scanner
        </Link>
      </Card>
    );
  }

  const { row, forCheck, cautions, lotText } = view;
  const lastCheck = data.sheet.lastCheck;
  const entered = isDraftEntered(draft, photo !== null);
  const choice = chooseSheetSteps({ state: row.state, findings: draft, entered, lastCheck });

  // Back where the grower came from: the round, the bag's page, or (by default) the scanner for the next bag.
  const leaveTo = () =>
    from === "today" ? "/today" : from === "bag" ? `/bags/view?id=${encodeURIComponent(forCheck.id)}` : `/scan?saved=${encodeURIComponent(row.code)}`;

  /** The save's checks and rows for these values (./check-save, loaded on the first tap if not yet warmed). */
  async function planSave(values: CheckDraft, end?: CheckEnd) {
    const { planCheckSave } = await loadSave();
    return planCheckSave(values, { bag: forCheck, now: new Date(), today, unit, newId: () => crypto.randomUUID() }, end);
  }

  async function persist(plan: CheckSavePlan) {
    setSaving(true);
    setSaveError(null);
    try {
      const { discardBag, pullBag, recordCheck, recordReading } = await loadRepo();
      await recordCheck(plan.check);
      if (plan.reading) await recordReading(plan.reading);
      if (photo) await (await import("@/lib/client/photos")).queuePhoto({ bagId: forCheck.id, checkId: plan.check.id, blob: photo.blob });
      if (plan.discard) await discardBag(plan.discard.id, plan.discard.discarded_on, plan.discard.discard_reason);
      else if (plan.pull) await pullBag(plan.pull.id, plan.pull.pulled_on);
      router.replace(leaveTo());
    } catch (e) {
      setSaving(false);
      setSaveError(e instanceof AppError ? e.message : "The check could not be saved on this phone. Try again; nothing was lost.");
    }
  }

  async function saveAllGood() {
    const r = await planSave(markAllGood(valuesNow()));
    if (r.ok) return void persist(r.plan);
    formRef.current?.showErrors(r.fields);
    setSaveError("Not saved: see the marked field below.");
  }

  // The details form's submit, once its values passed the save's checks (its resolver, `checkValues`).
  async function saveEntered(values: CheckDraft) {
    const r = await planSave(values);
    if (r.ok) void persist(r.plan);
  }

  async function checkValues(values: CheckDraft) {
    const r = await planSave(values);
    return r.ok ? null : r.fields;
  }

  /** A confirmed pull or discard: with the check when anything was entered, on its own otherwise. */
  async function endBag(end: CheckEnd) {
    if (!entered) {
      setSaving(true);
      setSaveError(null);
      try {
        const { discardBag, pullBag } = await loadRepo();
        if (end.kind === "pull") await pullBag(forCheck.id, end.on);
        else await discardBag(forCheck.id, end.on, end.reason);
        router.replace(leaveTo());
      } catch (e) {
        setSaving(false);
        setSaveError(e instanceof AppError ? e.message : "Not saved on this phone. Try again; nothing was lost.");
      }
      return;
    }
    const r = await planSave(valuesNow(), end);
    if (r.ok) return void persist(r.plan);
    formRef.current?.showErrors(r.fields);
    setEnding(null);
    setSaveError("Not saved: see the marked field below.");
  }

  function runStep(step: SheetStep) {
    if (step === "all_good" || step === "keep_chilling") return void saveAllGood();
    if (step === "save") return void formRef.current?.submit();
    setEnding((cur) => (cur === step ? null : step));
  }

  async function pickPhoto(file: File | undefined) {
    setPhotoNote(null);
    if (!file) return;
    try {
      const [{ compressPhoto }] = await loadPhotoTools();
      const blob = await compressPhoto(file);
      if (photo) URL.revokeObjectURL(photo.url);
      setPhoto({ blob, url: URL.createObjectURL(blob) });
    } catch (e) {
      setPhotoNote(e instanceof Error ? e.message : "That photo could not be read.");
    }
  }


  return (
    <div className="space-y-5">
      <Card className="space-y-2" data-testid="bag-header">
        <div className="flex items-start justify-between gap-2">
          <p className="font-mono text-code font-bold tracking-widest text-ink" aria-label={`Bag code ${row.codeShown}`}>
            {row.codeShown}
          </p>
          <StateBadge state={row.state} sprouts={data.sheet.lastCheck?.sprouts} />
        </div>
        <h1 className="text-title font-bold leading-snug text-glacier-800">
          {row.species}
          {row.commonName ? <span className="block text-body font-medium text-ink-soft">{row.commonName}</span> : null}
        </h1>
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-label">
          <dt className="text-ink-soft">Where</dt>
          <dd className="font-semibold">
            {row.storeName}
            {row.box ? ` · ${row.box}` : ""}
          </dd>
          <dt className="text-ink-soft">Pull window</dt>
          <dd className="font-semibold">
            {tools!.formatPullWindow(row.window, formatShortDay)}
          </dd>
          {lotText ? (
            <>
              <dt className="text-ink-soft">Lot</dt>
              <dd>{lotText}</dd>
            </>
          ) : null}
          <dt className="text-ink-soft">Last check</dt>
          <dd>
            {lastCheck
              ? `${formatShortDay(formatIsoDay(new Date(lastCheck.checked_at)))}: ${vocabularyLabels.moisture[lastCheck.moisture].toLowerCase()}, ${vocabularyLabels.mould[lastCheck.mould].toLowerCase()}, sprouts ${vocabularyLabels.sprouts[lastCheck.sprouts].toLowerCase()}`
              : "None yet"}
          </dd>
        </dl>
        {farmRoots?.line && (row.state === "chilling" || row.state === "window_open" || row.state === "overdue") ? (
          <p className="text-label text-glacier-800" data-testid="farm-roots-line">
            {farmRoots.line}
          </p>
        ) : null}
        {cautions.length ? (
          <p className="flex flex-wrap gap-2">
            {cautions.map((c) => (
              <span key={c.key} className="rounded-full bg-wheat-100 px-2.5 py-0.5 text-label font-semibold text-wheat-700">
                ⚠ {c.title}
              </span>
            ))}
          </p>
        ) : null}
      </Card>

      {!mayRecord ? (
        <p role="note" className="rounded-card bg-rime-100 p-3 text-label">
          {role ? "Your role on this farm can look at bags but not record checks." : "Sign in on this phone to record checks."}
        </p>
      ) : null}

      {saveError ? (
        <p role="alert" className="rounded-card bg-ember-100 p-3 font-semibold text-ember-700">
          {saveError}
        </p>
      ) : null}

      {mayRecord ? (
        <ChoiceBar
          choice={choice}
          busy={saving}
          ending={ending}
          onStep={runStep}
          pullPanel={
            <PullPanel today={today} startedOn={forCheck.startedOn} busy={saving} onConfirm={(on) => endBag({ kind: "pull", on })} onCancel={() => setEnding(null)} />
          }
          discardPanel={
            <DiscardPanel
              today={today}
              busy={saving}
              defaultReason={draft.mould === "spreading" || lastCheck?.mould === "spreading" ? spreadingMouldReason : ""}
              onConfirm={(on, reason) => endBag({ kind: "discard", on, reason })}
              onCancel={() => setEnding(null)}
            />
          }
        />
      ) : null}

      {Details ? (
        <Details
          handle={formRef}
          bag={{ ...forCheck, rootsWatchFrom: farmRoots?.watchFrom ?? null }}
          today={today}
          unit={unit}
          weeklyCheckDays={data.identity?.farm.weekly_check_days}
          lastCheck={lastCheck}
          entered={entered}
          check={checkValues}
          onDraft={setDraft}
          onValid={(values) => void saveEntered(values)}
          photo={
            <div className="space-y-2">
              <label htmlFor="check-photo" className="flex min-h-14 cursor-pointer items-center justify-center gap-2 rounded-card border-2 border-dashed border-glacier-600 bg-paper px-4 text-body font-semibold text-glacier-700">
                <span aria-hidden="true">◉</span> {photo ? "Retake photo" : "Take a photo"}
              </label>
              <input id="check-photo" type="file" accept="image/*" capture="environment" className="sr-only" onChange={(e) => void pickPhoto(e.target.files?.[0])} />
              {photoNote ? (
                <p role="alert" className="text-label font-medium text-ember-700">
                  {photoNote}
                </p>
              ) : null}
              {photo ? (
                <div className="flex items-center gap-3">
                  {/* eslint-disable-next-line @next/next/no-img-element -- a local blob preview, not a served image */}
                  <img src={photo.url} alt="The photo that will be saved with this check" className="h-24 w-24 rounded-xl object-cover" />
                  <div className="text-label text-ink-soft">
                    <p>{Math.round(photo.blob.size / 1024)} kB, kept on the phone until it can be sent.</p>
                    <button
                      type="button"
                      className="min-h-tap font-semibold text-ember-700 underline"
                      onClick={() => {
                        URL.revokeObjectURL(photo.url);
                        setPhoto(null);
                      }}
                    >
                      Remove photo
                    </button>
                  </div>
                </div>
              ) : null}
            </div>
          }
        />
      ) : (
        <p className="border-t-2 border-rime-200 pt-4 text-ink-soft">Opening the details…</p>
      )}

      <SheetCautions bagId={row.id} cautions={cautions} />
    </div>
  );
}

const choiceFrame: Record<SheetChoice["tone"], string> = {
  routine: "border-moss-600 bg-moss-100",
  decide: "border-glacier-600 bg-rime-100",
  act: "border-wheat-600 bg-wheat-100",
  trouble: "border-ember-600 bg-ember-100",
  closed: "border-rime-300 bg-rime-50",
};

/** The first steps the rule chose, largest first, kept in view under the header while the form scrolls. */
function ChoiceBar({
  choice,
  busy,
  ending,
  onStep,
  pullPanel,
  discardPanel,
}: {
  choice: SheetChoice;
  busy: boolean;
  ending: "pull" | "discard" | null;
  onStep: (step: SheetStep) => void;
  pullPanel: React.ReactNode;
  discardPanel: React.ReactNode;
}) {
  const stepButton = (step: SheetStep, size: "xl" | "lg" | "md") => {
    const tone = step === "discard" ? "danger" : step === "pull" ? "good" : step === "save" ? "primary" : "good";
    const quiet = size === "md";
    return (
      <Button
        key={step}
        tone={quiet ? (step === "discard" ? "danger" : "secondary") : tone}
        size={size}
        className={size === "md" ? "" : "flex-1"}
        disabled={busy}
        aria-expanded={step === "pull" || step === "discard" ? ending === step : undefined}
        onClick={() => onStep(step)}
        data-testid={step === "all_good" || step === "keep_chilling" ? "all-good" : `step-${step}`}
      >
        {step === "all_good" || step === "keep_chilling" ? <span aria-hidden="true" className="text-display leading-none">✓</span> : null}
        <span className="text-left leading-tight">
          {sheetStepLabels[step]}
          {step === "all_good" ? <span className="block text-label font-medium">damp, dry corners, clean, no sprouts</span> : null}
        </span>
      </Button>
    );
  };
  return (
    <section aria-label="What to do with this bag" className={`sticky top-14 z-20 space-y-2 rounded-card border-l-4 p-3 shadow-sm ${choiceFrame[choice.tone]}`} data-testid="choice" data-tone={choice.tone}>
      <p className="text-label font-semibold" data-testid="choice-why">
        {choice.why}
      </p>
      {choice.first.length ? <div className="flex gap-2">{choice.first.map((s) => stepButton(s, choice.first.length > 1 ? "lg" : "xl"))}</div> : null}
      {choice.then.length ? <div className="flex flex-wrap gap-2">{choice.then.map((s) => stepButton(s, "md"))}</div> : null}
      {ending === "pull" ? pullPanel : ending === "discard" ? discardPanel : null}
    </section>
  );
}
