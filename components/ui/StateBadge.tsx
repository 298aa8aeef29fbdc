import type { BagState } from "@/lib/schemas/vocabulary";
import { vocabularyLabels } from "@/lib/schemas/vocabulary";

// Each state has its own colour, its own shape and its own glyph, so the seven read apart at a glance, in
// greyscale, in outdoor light and for colour-blind eyes (the shapes are in app/globals.css: .state-*).
// Planned is pencilled in (dashed), chilling is frosted (solid pale), an open window is half filled, overdue is a
// hard-cornered dark block, pulled is soil brown in outline, sown is a solid green seedling, discarded is hatched
// and struck through.
const glyph: Record<BagState, string> = {
  planned: "○",
  chilling: "❄",
  window_open: "◐",
  overdue: "!",
  pulled: "↑",
  sown: "✿",
  discarded: "×",
};

export function StateBadge({ state }: { state: BagState }) {
  return (
    <span className={`state-badge state-${state}`} data-state={state}>
      <span aria-hidden="true">{glyph[state]}</span>
      {vocabularyLabels.bagState[state]}
    </span>
  );
}
