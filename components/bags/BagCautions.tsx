import { Caution } from "@/components/ui/Caution";
import type { BagCaution } from "@/components/check/bag-cautions";

/** A bag's cautions (picked by pickBagCautions), calm and short, deferring to local rules and the seed supplier. */
export function BagCautions({ cautions }: { cautions: readonly BagCaution[] }) {
  if (!cautions.length) return null;
  return (
    <div className="space-y-2" aria-label="Cautions">
      {cautions.map((c) => (
        <Caution key={c.key} title={c.title} tone={c.key === "treated" ? "strong" : "calm"}>
          <p>{c.text}</p>
          {c.key === "toxic" ? (
            <p className="mt-1 text-ink-soft">{c.source ? `Source: ${c.source}.` : "Flag from memory, not yet verified against a source."}</p>
          ) : null}
        </Caution>
      ))}
    </div>
  );
}
