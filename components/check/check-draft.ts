import { adviseOnCheck, scheduleNextCheck, type CheckAdvice, type CheckCadence, type NextCheck, type PullWindow } from "@/lib/domain/schedule";
import type { IsoDay } from "@/lib/domain/dates";
import { allGoodFindings } from "@/lib/schemas/words";
import type { BagState, CheckAction, Moisture, Mould, Sprouts } from "@/lib/schemas/words";

// The check sheet's logic without React: what the grower picked, what Rimebook advises, and the
// mutations a save makes (./check-save: check, optional reading, and the pull or discard the actions imply).

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
