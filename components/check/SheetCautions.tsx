"use client";

import { useReadCautions } from "@/lib/client/cautions-read";
import { Caution } from "@/components/ui/Caution";
import type { BagCaution } from "./bag-cautions";

// The check sheet's cautions: in full until the person says they have read them on this bag, then one small
// chip each (the full words one tap away), so the form is not pushed down on every visit.
export function SheetCautions({ bagId, cautions }: { bagId: string; cautions: BagCaution[] }) {
  const { read, markRead, canRemember } = useReadCautions(bagId);
  if (cautions.length === 0 || read === undefined) return null;
  const unread = cautions.filter((c) => !read.has(c.key));
  if (unread.length === 0) {
    return (
      <div className="flex flex-wrap gap-2" data-testid="cautions-folded" aria-label="Cautions you have read on this bag">
        {cautions.map((c) => (
          <details key={c.key} className="group w-full rounded-card bg-wheat-100 text-label text-ink open:p-3 sm:w-auto sm:open:w-full">
            <summary className="flex min-h-tap cursor-pointer items-center gap-1.5 px-3 font-semibold text-wheat-700 group-open:px-0">
              <span aria-hidden="true">⚠</span> {c.title}
            </summary>
            <p className="mt-1">{c.text}</p>
            {c.source ? <p className="mt-1 text-ink-soft">Source: {c.source}</p> : null}
          </details>
        ))}
      </div>
    );
  }
  return (
    <div className="space-y-2" data-testid="cautions-full">
      {unread.map((c) => (
        <Caution key={c.key} title={c.title}>
          {c.text}
          {c.source ? <span className="block text-ink-soft">Source: {c.source}</span> : null}
        </Caution>
      ))}
      {canRemember ? (
        <button
          type="button"
          onClick={() => void markRead(unread.map((c) => c.key))}
          className="min-h-tap rounded-card border-2 border-wheat-600 px-4 font-semibold text-wheat-700"
        >
          I have read {unread.length === 1 ? "this caution" : "these cautions"}
        </button>
      ) : null}
    </div>
  );
}
