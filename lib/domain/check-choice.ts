import type { BagState, Mould, Sprouts } from "@/lib/schemas/words";
import type { CheckFindings } from "./schedule";

// What a grower should do first with the bag in front of them: one rule for the check sheet's buttons and for
// the words and look of the bag's card on Today, so the two never disagree. A bag in trouble never offers
// "All good" first.

/** The steps a check sheet can offer. "keep_chilling" is the one-tap all good while the window is open. */
export type SheetStep = "all_good" | "keep_chilling" | "pull" | "discard" | "save";

/**
 * How the choice reads at a glance: routine work (a weekly look), a decision (the window is open), work to do
 * now (roots, past the latest pull, a problem found), trouble (spreading mould), or nothing due (closed).
 */
export type SheetTone = "routine" | "decide" | "act" | "trouble" | "closed";

export interface SheetChoiceInput {
  state: BagState;
  /** What the sheet shows now (the one-tap all good findings until the grower changes them). */
  findings: Pick<CheckFindings, "moisture" | "mould" | "sprouts">;
  /** Anything entered beyond the all good findings: another finding, an action, a note, a temperature, a photo. */
  entered: boolean;
  /** What the bag's last check saw, while it is still in the cold. */
  lastCheck?: { mould: Mould; sprouts: Sprouts; moisture?: CheckFindings["moisture"] } | null;
}

export interface SheetChoice {
  /** The largest buttons, in order; two are shown side by side. */
  first: SheetStep[];
  /** Smaller buttons after them. */
  then: SheetStep[];
  tone: SheetTone;
  /** One line in grower words: why these come first. */
  why: string;
}

const inTheCold = (s: BagState) => s === "chilling" || s === "window_open" || s === "overdue";

export function chooseSheetSteps({ state, findings, entered, lastCheck }: SheetChoiceInput): SheetChoice {
  if (!inTheCold(state)) {
    const why =
      state === "planned"
        ? "This bag has not started its cold yet: checks begin once it has a start date."
        : "No more checks are due for this bag; a check saved here is still kept in its record.";
    return { first: entered ? ["save"] : [], then: entered ? [] : ["save"], tone: "closed", why };
  }
  // What counts is what the grower sees now; with nothing entered yet, the last check's finding still stands.
  const seen = entered ? findings : { mould: lastCheck?.mould ?? findings.mould, sprouts: lastCheck?.sprouts ?? findings.sprouts };
  if (seen.mould === "spreading") {
    return {
      first: ["discard"],
      then: ["save"],
      tone: "trouble",
      why: entered
        ? "Mould is spreading: discard the bag sealed, or rescue clean-looking seed into a fresh bag and save the check."
        : "The last check found mould spreading: discard the bag sealed, or rescue clean-looking seed.",
    };
  }
  if (seen.sprouts !== "none") {
    const many = seen.sprouts === "many";
    return {
      first: ["pull"],
      then: ["save"],
      tone: "act",
      why: entered
        ? many
          ? "Many seeds have sprouted: pull the bag and sow today."
          : "First roots are showing: pull the bag now and sow."
        : "The last check found roots: pull the bag now and sow.",
    };
  }
  if (state === "overdue") {
    return { first: ["pull"], then: ["save"], tone: "act", why: "Past its latest pull day: pull it now, or say why it stays in." };
  }
  if (entered) {
    const problem = findings.moisture !== "damp" || findings.mould !== "clean";
    return { first: ["save"], then: state === "window_open" ? ["pull"] : [], tone: problem ? "act" : "routine", why: problem ? "Do what the advice says, then save the check." : "Save what you found." };
  }
  const lastProblem = lastCheck && (lastCheck.mould === "spots" || (lastCheck.moisture !== undefined && lastCheck.moisture !== "damp"));
  if (state === "window_open") {
    return {
      first: ["keep_chilling", "pull"],
      then: [],
      tone: lastProblem ? "act" : "decide",
      why: "The pull window is open: all good and back in the cold, or pull it now.",
    };
  }
  return {
    first: ["all_good"],
    then: [],
    tone: lastProblem ? "act" : "routine",
    why: lastProblem ? "Put right at the last check? One tap if it is fine now; otherwise record what you find." : "Damp with dry corners, clean, no roots? One tap.",
  };
}

/** The words on each step's button. */
export const sheetStepLabels: Record<SheetStep, string> = {
  all_good: "All good",
  keep_chilling: "All good, keep chilling",
  pull: "Pull now",
  discard: "Discard",
  save: "Save check",
};
