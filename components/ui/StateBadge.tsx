import type { BagState, Sprouts } from "@/lib/schemas/words";
import { vocabularyLabels } from "@/lib/schemas/words";
import { findBadgeKind, type BadgeKind } from "@/lib/domain/sow-queue";

// Each state has its own colour, its own shape and its own glyph, so they read apart at a glance, in greyscale,
// in outdoor light and for colour-blind eyes (the shapes are in app/globals.css: .state-*). Planned is pencilled in
// (dashed), chilling is frosted (solid pale), an open window is half filled, overdue is a hard-cornered dark block,
// roots showing is a double ember outline, pulled is soil brown in outline, sown is a solid green seedling,
// discarded is hatched and struck through.
const glyph: Record<BadgeKind, string> = {
  planned: "○",
  chilling: "❄",
  window_open: "◐",
  overdue: "!",
  roots_showing: "⤒",
  pulled: "↑",
  sown: "✿",
  discarded: "×",
};

const words: Record<BadgeKind, string> = { ...vocabularyLabels.bagState, roots_showing: "Roots showing" };

/** `sprouts`: the bag's last check, so a bag whose roots show no longer reads "Chilling". */
export function StateBadge({ state, sprouts }: { state: BagState; sprouts?: Sprouts | null }) {
  const kind = findBadgeKind(state, sprouts);
  return (
    <span className={`state-badge state-${kind}`} data-state={state} data-kind={kind} data-testid="state-badge">
      <span aria-hidden="true">{glyph[kind]}</span>
      {words[kind]}
    </span>
  );
}
