import type { BagState } from "@/lib/schemas/vocabulary";
import { vocabularyLabels } from "@/lib/schemas/vocabulary";

// Each state has a colour AND a glyph, so colour is never the only signal (outdoor light, colour blindness).
const look: Record<BagState, { cls: string; glyph: string }> = {
  planned: { cls: "bg-rime-100 text-ink-soft", glyph: "○" },
  chilling: { cls: "bg-rime-200 text-glacier-800", glyph: "❄" },
  window_open: { cls: "bg-wheat-100 text-wheat-700", glyph: "◐" },
  overdue: { cls: "bg-ember-100 text-ember-700", glyph: "!" },
  pulled: { cls: "bg-moss-100 text-moss-700", glyph: "↑" },
  sown: { cls: "bg-moss-100 text-moss-700", glyph: "✿" },
  discarded: { cls: "bg-rime-100 text-ink-soft line-through", glyph: "×" },
};

export function StateBadge({ state }: { state: BagState }) {
  const l = look[state];
  return (
    <span className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-label font-semibold ${l.cls}`} data-state={state}>
      <span aria-hidden="true">{l.glyph}</span>
      {vocabularyLabels.bagState[state]}
    </span>
  );
}
