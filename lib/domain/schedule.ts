import type { Protocol } from "@/lib/schemas/protocol";
import type { BagState, CheckAction, Moisture, Mould, PhaseKind, Sprouts } from "@/lib/schemas/words";
import { DomainError } from "@/lib/errors";
import { addDaysToIsoDay, parseIsoDay, pickEarlierDay, pickLaterDay, type IsoDay } from "./dates";
import { reconcileProtocol, type ReconciledProtocol } from "./protocols";

export interface PullWindow {
  opensOn: IsoDay;
  /** Null when a source sets no upper limit: the bag is never overdue, pull when roots show. */
  closesOn: IsoDay | null;
  /** Common practice: plan the pull for the earliest date and check daily from then. */
  plannedPullOn: IsoDay;
  sourcesDisagree: boolean;
}

export interface BagPhasePlan {
  kind: PhaseKind;
  /** Earliest and latest day this phase can begin (earlier phases run their shortest or longest time). */
  startsOn: IsoDay;
  startsLatestOn: IsoDay | null;
  endsOn: IsoDay;
  endsLatestOn: IsoDay | null;
}

export interface BagPlan {
  phases: BagPhasePlan[];
  window: PullWindow | null;
  /** Day the bag should move to its next phase (e.g. warm → fridge), when that move is still ahead. */
  nextMoveOn: IsoDay | null;
  nextMoveTo: PhaseKind | null;
}

export type ProtocolForPlan = Pick<Protocol, "species" | "phases" | "effectiveBand">;

function toReconciled(protocol: ProtocolForPlan | ReconciledProtocol): ReconciledProtocol {
  return "timedPhases" in protocol ? protocol : reconcileProtocol(protocol);
}

/**
 * Lays the protocol's timed phases end to end from the start day (warm phase first, if any).
 * `finalPhaseStartedOn`: when the bag really moved into its last phase (e.g. into the fridge), the window counts from then.
 */
export function planBagPhases(
  protocol: ProtocolForPlan | ReconciledProtocol,
  startedOn: IsoDay,
  finalPhaseStartedOn: IsoDay | null = null,
): BagPlan {
  parseIsoDay(startedOn, "start date");
  const timed = toReconciled(protocol).timedPhases;
  if (timed.length === 0) return { phases: [], window: null, nextMoveOn: null, nextMoveTo: null };
  const phases: BagPhasePlan[] = [];
  let early = startedOn;
  let late: IsoDay | null = startedOn;
  timed.forEach((phase, i) => {
    if (i === timed.length - 1 && finalPhaseStartedOn) {
      early = finalPhaseStartedOn;
      late = finalPhaseStartedOn;
    }
    const endsOn = addDaysToIsoDay(early, phase.minDays);
    const endsLatestOn = late === null || phase.maxDays === null ? null : addDaysToIsoDay(late, phase.maxDays);
    phases.push({ kind: phase.kind, startsOn: early, startsLatestOn: late, endsOn, endsLatestOn });
    early = endsOn;
    late = endsLatestOn;
  });
  const last = phases[phases.length - 1];
  const window: PullWindow = {
    opensOn: last.endsOn,
    closesOn: last.endsLatestOn,
    plannedPullOn: last.endsOn,
    sourcesDisagree: timed.some((p) => p.sourcesDisagree),
  };
  const moving = phases.length > 1 && !finalPhaseStartedOn;
  return {
    phases,
    window,
    nextMoveOn: moving ? phases[phases.length - 1].startsOn : null,
    nextMoveTo: moving ? last.kind : null,
  };
}

export function computePullWindow(
  protocol: ProtocolForPlan | ReconciledProtocol,
  startedOn: IsoDay,
  finalPhaseStartedOn: IsoDay | null = null,
): PullWindow | null {
  return planBagPhases(protocol, startedOn, finalPhaseStartedOn).window;
}

/** What the bag's own records say; dates are yyyy-MM-dd. */
export interface BagRecord {
  startedOn: IsoDay | null;
  pulledOn?: IsoDay | null;
  sownOn?: IsoDay | null;
  discardedOn?: IsoDay | null;
}

export function determineBagState(bag: BagRecord, window: PullWindow | null, today: IsoDay): BagState {
  if (bag.discardedOn) return "discarded";
  if (bag.sownOn) return "sown";
  if (bag.pulledOn) return "pulled";
  if (!bag.startedOn || bag.startedOn > today) return "planned";
  if (!window || today < window.opensOn) return "chilling";
  if (window.closesOn === null || today <= window.closesOn) return "window_open";
  return "overdue";
}

export interface CheckFindings {
  on: IsoDay;
  moisture: Moisture;
  mould: Mould;
  sprouts: Sprouts;
  actions?: readonly CheckAction[];
}

export interface CheckCadence {
  /** Days between checks while chilling, before the window opens (weekly by default). */
  everyDaysBeforeWindow: number;
  /** Sooner follow-ups after a problem (common practice: 1–2 days). */
  followUpDays: { soggy: number; dry: number; mouldSpots: number; mouldRescued: number };
}

export const defaultCheckCadence: CheckCadence = {
  everyDaysBeforeWindow: 7,
  followUpDays: { soggy: 1, dry: 2, mouldSpots: 1, mouldRescued: 1 },
};

export type NextCheckReason =
  | "discard_now"
  | "pull_now"
  | "overdue"
  | "window_opens"
  | "follow_up"
  | "move_to_next_phase"
  | "window_daily"
  /** Daily before the window because the farm's own bags showed roots this early (farm history). */
  | "roots_watch"
  /** The routine check before the window (every few days; the name stays from the weekly default). */
  | "weekly";

export interface NextCheck {
  on: IsoDay;
  reason: NextCheckReason;
  /** Short calm words for the round. */
  note: string;
}

export interface NextCheckInput {
  state: BagState;
  startedOn: IsoDay | null;
  window: PullWindow | null;
  lastCheck?: CheckFindings | null;
  nextMoveOn?: IsoDay | null;
  cadence?: CheckCadence;
  /** The bag's own days between checks before its window (bag setting); overrides the farm's rhythm when set. */
  checkEveryDays?: number | null;
  /** From this day the farm's own history says roots may show (lib/domain/farm-history findRootsWatchDay): daily from then. */
  rootsWatchFrom?: IsoDay | null;
}

const rescueActions: readonly CheckAction[] = ["removed_mouldy_seed", "fresh_towel"];

function findFollowUp(check: CheckFindings, cadence: CheckCadence): { days: number; note: string } | null {
  const rescued = (check.actions ?? []).some((a) => rescueActions.includes(a));
  const options: { days: number; note: string }[] = [];
  if (check.mould === "spreading" && rescued) options.push({ days: cadence.followUpDays.mouldRescued, note: "Look again for mould after the rescue." });
  if (check.mould === "spots") options.push({ days: cadence.followUpDays.mouldSpots, note: "Look again for mould spots." });
  if (check.moisture === "soggy") options.push({ days: cadence.followUpDays.soggy, note: "See whether the medium has dried to damp." });
  if (check.moisture === "dry") options.push({ days: cadence.followUpDays.dry, note: "See whether the medium stayed damp." });
  if (options.length === 0) return null;
  return options.reduce((a, b) => (b.days < a.days ? b : a));
}

function assertCheckDays(days: number): void {
  if (days < 1 || !Number.isInteger(days)) throw new DomainError("Days between checks must be a whole number of at least 1.");
}

/**
 * Next check: every few days before the window (the bag's own setting, else the farm's rhythm, weekly by default),
 * daily inside it and after it, sooner after a problem, and at once when the last check found roots (sow when about
 * 10 % of the seed shows a radicle: Forest Research) or spreading mould. Weekly-then-daily is common practice.
 * Returns null when nothing is left to check (planned, pulled, sown, discarded).
 */
export function scheduleNextCheck(input: NextCheckInput): NextCheck | null {
  const { state, window, startedOn } = input;
  const cadence = input.cadence ?? defaultCheckCadence;
  assertCheckDays(cadence.everyDaysBeforeWindow);
  const ownDays = input.checkEveryDays ?? null;
  if (ownDays !== null) assertCheckDays(ownDays);
  const everyDays = ownDays ?? cadence.everyDaysBeforeWindow;
  if (state !== "chilling" && state !== "window_open" && state !== "overdue") return null;
  if (!startedOn) return null;
  const check = input.lastCheck ?? null;
  const rescued = check ? (check.actions ?? []).some((a) => rescueActions.includes(a)) : false;
  if (check && check.mould === "spreading" && !rescued) {
    return { on: check.on, reason: "discard_now", note: "Mould was spreading: discard the bag sealed." };
  }
  if (check && check.sprouts !== "none") {
    return {
      on: check.on,
      reason: "pull_now",
      note:
        check.sprouts === "many"
          ? "Many seeds had sprouted: pull and sow today, before the roots tangle."
          : "First roots were showing: pull now and sow.",
    };
  }

  const last = check ? pickLaterDay(check.on, startedOn) : startedOn;
  let on: IsoDay;
  let reason: NextCheckReason;
  let note: string;
  const nextDay = addDaysToIsoDay(last, 1);
  if (window && nextDay >= window.opensOn) {
    on = nextDay;
    reason = window.closesOn !== null && on > window.closesOn ? "overdue" : "window_daily";
    note = reason === "overdue" ? "Past the latest pull date: pull and sow, or note why it stays." : "Pull window open: check daily.";
  } else {
    const routine = addDaysToIsoDay(last, everyDays);
    on = window ? pickEarlierDay(routine, window.opensOn) : routine;
    reason = window && on === window.opensOn ? "window_opens" : "weekly";
    note =
      reason === "window_opens"
        ? "Pull window opens: start daily checks."
        : ownDays !== null
          ? `Routine check (this bag: every ${ownDays === 1 ? "day" : `${ownDays} days`}).`
          : "Routine check.";
    // The farm's own bags of this species showed roots this early: daily from that day, before the window.
    const watch = input.rootsWatchFrom ?? null;
    if (watch !== null && pickLaterDay(watch, nextDay) < on) {
      on = pickLaterDay(watch, nextDay);
      reason = "roots_watch";
      note = "On this farm roots have shown by now: check daily.";
    }
  }

  // Past the latest pull today, even when the last check was before the window: say so, not "window opens".
  if (state === "overdue" && reason !== "overdue") {
    reason = "overdue";
    note = "Past the latest pull date: pull and sow, or note why it stays.";
  }

  // A move still not recorded stays due (and shows as late) until the bag's move is recorded.
  if (input.nextMoveOn && input.nextMoveOn <= on) {
    on = input.nextMoveOn;
    reason = "move_to_next_phase";
    note = "Warm phase done: move the bag to the cold store.";
  }
  if (check) {
    const followUp = findFollowUp(check, cadence);
    if (followUp) {
      const fuOn = addDaysToIsoDay(check.on, followUp.days);
      if (fuOn <= on) {
        on = fuOn;
        reason = "follow_up";
        note = followUp.note;
      }
    }
  }
  return { on, reason, note };
}

export type AdviceLevel = "fine" | "attention" | "act_now";

export interface CheckAdvice {
  level: AdviceLevel;
  headline: string;
  steps: string[];
}

/** The advice for one finding, shown right under the choice that caused it. Null when the finding is the good one. */
export interface FindingAdviceSet {
  moisture: CheckAdvice | null;
  mould: CheckAdvice | null;
  sprouts: CheckAdvice | null;
}

/** Calm grower words for each finding of a check, one piece per finding. */
export function adviseOnFindings(findings: Pick<CheckFindings, "moisture" | "mould" | "sprouts">): FindingAdviceSet {
  const mould: CheckAdvice | null =
    findings.mould === "spreading"
      ? {
          level: "act_now",
          headline: "Mould is spreading: discard this bag.",
          steps: [
            "Keep the bag sealed and put it straight in the bin.",
            "Do not open it near your face or sniff it.",
            "Wash your hands afterwards.",
            "If the seed is precious, you may rescue clean-looking seeds onto fresh damp medium in a new bag, and check again tomorrow.",
          ],
        }
      : findings.mould === "spots"
        ? { level: "attention", headline: "A few mould spots.", steps: ["Lift out the seeds with mould on them and blot the medium; check again tomorrow.", "Wash your hands afterwards."] }
        : null;
  const sprouts: CheckAdvice | null =
    findings.sprouts === "many"
      ? {
          level: "act_now",
          headline: "Many seeds have sprouted: pull and sow today.",
          steps: [
            "Handle sprouted seeds gently; the young roots break easily.",
            // Past the usual sign (about 10 % of the seed chitted: Forest Research): roots grow into the medium and each other.
            "Sow today: long roots tangle in the medium and each other. Tease seeds apart rather than pulling, and sow the whole clump where they will not separate.",
            "Next time pull this species earlier: when about one seed in ten shows a root.",
          ],
        }
      : findings.sprouts === "first_roots"
        ? { level: "act_now", headline: "First roots are showing: pull now and sow.", steps: ["Handle sprouted seeds gently; the young roots break easily."] }
        : null;
  const moisture: CheckAdvice | null =
    findings.moisture === "soggy"
      ? { level: "attention", headline: "The medium is soggy.", steps: ["Blot it with a dry towel until there is no free water; too wet breeds mould. Check again tomorrow."] }
      : findings.moisture === "dry"
        ? {
            level: "attention",
            headline: "The medium has dried out.",
            steps: ["Add a few drops of water until it is damp with dry corners; seed that dries out can fall back asleep. Check again in two days."],
          }
        : null;
  return { moisture, mould, sprouts };
}

/** Calm grower words for what a check found, all findings together. */
export function adviseOnCheck(findings: Pick<CheckFindings, "moisture" | "mould" | "sprouts">): CheckAdvice {
  const each = adviseOnFindings(findings);
  // Spreading mould decides alone; roots name the headline next; smaller problems add their steps.
  if (each.mould?.level === "act_now") return each.mould;
  const parts = [each.sprouts, each.mould, each.moisture].filter((a): a is CheckAdvice => a !== null);
  if (parts.length === 0) return { level: "fine", headline: "All good: damp with dry corners, clean, no roots yet.", steps: [] };
  return { level: parts[0].level, headline: parts[0].headline, steps: parts.flatMap((a) => a.steps) };
}
