"use client";

import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { loadStoreHistory } from "@/lib/client/history-reads";
import { formatIsoDay } from "@/lib/domain/dates";
import { buildDryingHistory, findBoxesToLookAt } from "@/lib/domain/rows/farm-history-rows";
import { Card } from "@/components/ui/Card";
import { formatShortDay } from "@/components/bags/format-day";

// How fast bags go from damp to dry in this store (the farm's own checks; Kaplan–Meier, bags pulled before drying
// counted to their last check), and which box to look at first.
export function DryingPanel({ storeId }: { storeId: string }) {
  const data = useLiveQuery(async () => {
    const today = formatIsoDay(new Date());
    const { bags, checksByBag } = await loadStoreHistory(getLocalDb(), storeId);
    const history = buildDryingHistory(bags, checksByBag, today);
    return { today, history, lookAt: findBoxesToLookAt(bags, checksByBag, history, today) };
  }, [storeId]);
  if (!data) return null;
  const { today } = data;
  const whole = data.history.find((h) => h.box === "");
  if (!whole || whole.curve.n === 0) return null;
  const boxes = data.history.filter((h) => h.box !== "" && h.curve.median !== null).sort((a, b) => a.box.localeCompare(b.box, "en", { numeric: true }));
  return (
    <Card className="space-y-2" data-testid="drying-history">
      <h2 className="text-body font-bold text-glacier-800">How fast bags dry here</h2>
      <p className="text-body">
        {whole.curve.median !== null
          ? `Bags in this store go from damp to dry in about ${whole.curve.median} days`
          : `Fewer than half the damp spells here ended dry`}{" "}
        <span className="text-label text-ink-soft">
          ({whole.curve.n} damp spells, {whole.curve.events} ended dry; the rest counted up to their last check).
        </span>
      </p>
      {boxes.length > 1 ? (
        <ul className="text-label">
          {boxes.map((b) => (
            <li key={b.box}>
              {b.box}: about {b.curve.median} days ({b.curve.n} spells)
            </li>
          ))}
        </ul>
      ) : null}
      {data.lookAt.length ? (
        <p className="text-label font-semibold text-glacier-800">
          Look at{" "}
          {data.lookAt
            .slice(0, 3)
            .map((l) => `${l.box || "the bags"} ${l.by <= today ? "today" : `by ${formatShortDay(l.by)}`}`)
            .join(", ")}
          .
        </p>
      ) : null}
    </Card>
  );
}
