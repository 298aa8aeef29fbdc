import { Caution, cautionTexts } from "@/components/ui/Caution";
import type { BagCautionChoice, BagCautionKey } from "./new-bag-defaults";

const titles: Record<BagCautionKey, string> = {
  toxic: "Toxic seed",
  treated: "Treated seed",
  foodFridge: "This store also holds food",
  medicinal: "Medicinal plant",
};

/** The cautions a bag needs (chosen by chooseBagCautions), calm and short, deferring to local rules and the supplier. */
export function BagCautions({ cautions }: { cautions: readonly BagCautionChoice[] }) {
  if (!cautions.length) return null;
  return (
    <div className="space-y-2" aria-label="Cautions">
      {cautions.map((c) => (
        <Caution key={c.key} title={titles[c.key]} tone={c.key === "treated" || (c.key === "foodFridge" && cautions.some((x) => x.key === "toxic" || x.key === "treated")) ? "strong" : "calm"}>
          <p>{cautionTexts[c.key]}</p>
          {c.source ? <p className="mt-1 text-ink-soft">{c.source}</p> : null}
        </Caution>
      ))}
    </div>
  );
}
