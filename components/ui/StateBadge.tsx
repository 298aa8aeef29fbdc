import type { BagState, Sprouts } from "@/lib/schemas/vocabulary";
import { vocabularyLabels } from "@/lib/schemas/vocabulary";
import { findBadgeKind, type BadgeKind } from "@/lib/domain/sow-queue";

// Each state has a colour AND a glyph, so colour is never the only signal (outdoor light, colour blindness).
const look: Record<BadgeKind, { cls: string; glyph: string }> = {
  planned: { cls: "bg-rime-100 text-ink-soft", glyph: "○" },
  chilling: { cls: "bg-rime-200 text-glacier-800", glyph: "❄" },
  window_open: { cls: "bg-wheat-100 text-wheat-700", glyph: "◐" },
  overdue: { cls: "bg-ember-100 text-ember-700", glyph: "!" },
  roots_showing: { cls: "bg-ember-100 text-ember-700", glyph: "⤒" },
  pulled: { cls: "bg-moss-100 text-moss-700", glyph: "↑" },
  sown: { cls: "bg-moss-100 text-moss-700", glyph: "✿" },
  discarded: { cls: "bg-rime-100 text-ink-soft line-through", glyph: "×" },
};

const words: Record<BadgeKind, string> = { ...vocabularyLabels.bagState, roots_showing: "Roots showing" };

/** `sprouts`: the bag's last check, so a bag whose roots show no longer reads "Chilling". */
export function StateBadge({ state, sprouts }: { state: BagState; sprouts?: Sprouts | null }) {
  const kind = findBadgeKind(state, sprouts);
  const l = look[kind];
  return (
    <span className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-label font-semibold ${l.cls}`} data-testid="state-badge">
      <span aria-hidden="true">{l.glyph}</span>
      {words[kind]}
    </span>
  );
}
