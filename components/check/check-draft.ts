import { adviseOnCheck, scheduleNextCheck, type CheckAdvice, type CheckCadence, type NextCheck, type PullWindow } from "@/lib/domain/schedule";
import type { IsoDay } from "@/lib/domain/dates";
import { parseTemperature, type TemperatureUnit } from "@/lib/domain/units";
import { DomainError } from "@/lib/errors";
import { allGoodFindings } from "@/lib/schemas/check";
import { mutationTable, type MutationArgs } from "@/lib/schemas/mutations";
import { Reading } from "@/lib/schemas/reading";
import type { BagState, CheckAction, Moisture, Mould, Sprouts } from "@/lib/schemas/vocabulary";

// The check sheet's logic without React: what the grower picked, what Rimebook advises, and the
// mutations a save makes (check, optional reading, and the pull or discard the actions imply).

export interface CheckDraft {
  moisture: Moisture;
  mould: Mould;
  sprouts: Sprouts;
  actions: CheckAction[];
  note: string;
  /** As typed, in the farm's unit unless the grower wrote °C/°F; empty when not taken. */
  temperatureText: string;
}

export const spreadingMouldReason = "Mould spreading (found at a check).";

export const allGoodDraft: CheckDraft = { ...allGoodFindings, actions: [], note: "", temperatureText: "" };

/** The one-tap save: the findings are "all good"; a note, temperature or action already entered is kept. */
export function markAllGood(draft: CheckDraft): CheckDraft {
  return { ...draft, ...allGoodFindings };
}

/** Anything entered beyond the one-tap all good: another finding, an action, a note, a temperature or a photo. */
export function isDraftEntered(draft: CheckDraft, hasPhoto = false): boolean {
  return (
    hasPhoto ||
    draft.moisture !== allGoodDraft.moisture ||
    draft.mould !== allGoodDraft.mould ||
    draft.sprouts !== allGoodDraft.sprouts ||
    draft.actions.length > 0 ||
    draft.note.trim() !== "" ||
    draft.temperatureText.trim() !== ""
  );
}

/** Pulling or discarding from the sheet: its own confirmed step with its own date (and, for a discard, a reason). */
export type CheckEnd = { kind: "pull"; on: IsoDay } | { kind: "discard"; on: IsoDay; reason: string | null };

export interface BagForCheck {
  id: string;
  storeId: string | null;
  startedOn: IsoDay | null;
  state: BagState;
  window: PullWindow | null;
  nextMoveOn: IsoDay | null;
  /** The bag's own days between checks before its window, when set. */
  checkEveryDays?: number | null;
  /** From this day the farm's history says roots may show (daily checks from then, as on Today). */
  rootsWatchFrom?: IsoDay | null;
}

export interface CheckPreview {
  advice: CheckAdvice;
  /** Null when nothing is left to check (pulled, discarded, not yet started). */
  next: NextCheck | null;
  nextText: string;
  showMouldCaution: boolean;
  /** Roots found but "Pulled" not ticked: the sheet nudges. */
  suggestPull: boolean;
}

export function toggleAction(actions: readonly CheckAction[], action: CheckAction): CheckAction[] {
  return actions.includes(action) ? actions.filter((a) => a !== action) : [...actions, action];
}

export function previewCheck(
  draft: CheckDraft,
  bag: BagForCheck,
  today: IsoDay,
  cadence?: CheckCadence,
  formatDay: (day: IsoDay) => string = (d) => d,
): CheckPreview {
  const advice = adviseOnCheck(draft);
  const ends = draft.actions.includes("discarded") ? "discarded" : draft.actions.includes("pulled") ? "pulled" : null;
  const next = ends
    ? null
    : scheduleNextCheck({
        state: bag.state,
        startedOn: bag.startedOn,
        window: bag.window,
        lastCheck: { on: today, moisture: draft.moisture, mould: draft.mould, sprouts: draft.sprouts, actions: draft.actions },
        nextMoveOn: bag.nextMoveOn,
        cadence,
        checkEveryDays: bag.checkEveryDays ?? null,
        rootsWatchFrom: bag.rootsWatchFrom ?? null,
      });
  let nextText: string;
  if (ends) nextText = `No more checks: the bag is ${ends}.`;
  else if (!next) nextText = bag.state === "planned" ? "No checks until the bag starts chilling." : "No more checks for this bag.";
  else nextText = next.on <= today ? `Act today: ${next.note}` : `Next check ${formatDay(next.on)}: ${next.note}`;
  return {
    advice,
    next,
    nextText,
    showMouldCaution: draft.mould !== "clean",
    suggestPull: draft.sprouts !== "none" && !ends && draft.mould !== "spreading",
  };
}

export interface CheckSaveContext {
  bag: Pick<BagForCheck, "id" | "storeId">;
  now: Date;
  today: IsoDay;
  unit: TemperatureUnit;
  newId: () => string;
}

export interface CheckSavePlan {
  check: MutationArgs<"check.record">;
  reading: MutationArgs<"reading.record"> | null;
  pull: MutationArgs<"bag.pull"> | null;
  discard: MutationArgs<"bag.discard"> | null;
}

export type CheckSaveResult = { ok: true; plan: CheckSavePlan } | { ok: false; fields: Partial<Record<"temperature" | "note" | "form", string>> };

/** Validates the draft with the shared mutation schemas and lays out what to save; `end` pulls or discards too. */
export function planCheckSave(draft: CheckDraft, ctx: CheckSaveContext, end?: CheckEnd): CheckSaveResult {
  let temperatureC: number | null = null;
  if (draft.temperatureText.trim() !== "") {
    try {
      temperatureC = Math.round(parseTemperature(draft.temperatureText, ctx.unit).celsius * 10) / 10;
    } catch (e) {
      return { ok: false, fields: { temperature: e instanceof DomainError ? e.message : "That is not a temperature." } };
    }
    // The reading schema holds the grower-worded range check ("Hotter than any store…").
    const inRange = Reading.shape.temperature_c.safeParse(temperatureC);
    if (!inRange.success) return { ok: false, fields: { temperature: inRange.error.issues[0]?.message ?? "Check the temperature." } };
  }
  const at = ctx.now.toISOString();
  const checkId = ctx.newId();
  // The check's record says what ended the bag, as it did when these were ticked among the actions.
  const endAction = end?.kind === "pull" ? "pulled" : end?.kind === "discard" ? "discarded" : null;
  const actions = endAction && !draft.actions.includes(endAction) ? [...draft.actions, endAction] : draft.actions;
  const check = mutationTable["check.record"].args.safeParse({
    id: checkId,
    bag_id: ctx.bag.id,
    checked_at: at,
    moisture: draft.moisture,
    mould: draft.mould,
    sprouts: draft.sprouts,
    actions,
    note: draft.note.trim() === "" ? null : draft.note,
    temperature_c: temperatureC,
  });
  if (!check.success) {
    const fields: Partial<Record<"temperature" | "note" | "form", string>> = {};
    for (const issue of check.error.issues) {
      const key = issue.path[0] === "note" ? "note" : issue.path[0] === "temperature_c" ? "temperature" : "form";
      fields[key] ??= issue.message;
    }
    return { ok: false, fields };
  }
  let reading: MutationArgs<"reading.record"> | null = null;
  if (temperatureC !== null && ctx.bag.storeId) {
    const parsed = mutationTable["reading.record"].args.safeParse({
      id: ctx.newId(),
      store_id: ctx.bag.storeId,
      taken_at: at,
      temperature_c: temperatureC,
      origin: "check",
      check_id: checkId,
    });
    if (!parsed.success) return { ok: false, fields: { temperature: parsed.error.issues[0]?.message ?? "Check the temperature." } };
    reading = parsed.data;
  }
  const discarded = actions.includes("discarded");
  const pulled = !discarded && actions.includes("pulled");
  const endOn = end?.on ?? ctx.today;
  const discardReason = end?.kind === "discard" && end.reason ? end.reason : draft.mould === "spreading" ? spreadingMouldReason : null;
  return {
    ok: true,
    plan: {
      check: check.data,
      reading,
      pull: pulled ? { id: ctx.bag.id, pulled_on: endOn } : null,
      discard: discarded ? { id: ctx.bag.id, discarded_on: endOn, discard_reason: discardReason } : null,
    },
  };
}
