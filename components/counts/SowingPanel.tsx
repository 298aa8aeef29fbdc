"use client";

import { useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { useMember } from "@/components/season/use-member";
import { useToday } from "@/components/bags/use-farm-rows";
import { formatShortDay as formatDay } from "@/components/bags/format-day";
import { pickDailyTotals } from "@/lib/domain/count-rules";
import { summarizeSowing } from "./count-series";
import { CountStepper } from "./CountStepper";
import { GerminationCurve } from "./GerminationCurve";
import { GerminationMetrics } from "./GerminationMetrics";
import { SowingForm } from "./SowingForm";

/**
 * Sowing and germination counts for one bag: record the sowing, count day by day, read the metrics and the curve.
 * Embeddable (the bag page uses it); reads and writes only the phone store, so it works with no signal.
 */
export function SowingPanel({ bagId }: { bagId: string }) {
  const { can } = useMember();
  const [adding, setAdding] = useState(false);
  const today = useToday();
  const data = useLiveQuery(async () => {
    const db = getLocalDb();
    const bag = await db.bags.get(bagId);
    const sowings = (await db.sowings.where("bag_id").equals(bagId).toArray()).filter((s) => !s.deleted_at).sort((a, b) => a.sown_on.localeCompare(b.sown_on) || a.created_at.localeCompare(b.created_at));
    const counts = await db.counts.where("sowing_id").anyOf(sowings.map((s) => s.id)).toArray();
    return { bag: bag ?? null, sowings, counts };
  }, [bagId]);

  if (data === undefined) return <p className="text-ink-soft">Opening…</p>;
  const { bag, sowings, counts } = data;
  if (!bag) return <p className="text-ink-soft">This bag is not on this phone.</p>;
  const canSow = can("sowing.record") && !bag.discarded_on;

  return (
    <section aria-label="Sowing and counts" className="space-y-4">
      {sowings.length === 0 ? (
        <Card>
          <h2 className="mb-1 text-body font-bold text-glacier-800">Sowing</h2>
          {bag.discarded_on ? (
            <p className="text-label text-ink-soft">This bag was discarded; there is nothing to sow.</p>
          ) : canSow ? (
            <>
              <p className="mb-3 text-label text-ink-soft">
                {bag.pulled_on ? `Pulled on ${formatDay(bag.pulled_on)}. Record the sowing to start counting.` : "Not pulled yet: saving a sowing also records the pull."}
              </p>
              <SowingForm bag={bag} today={today} />
            </>
          ) : (
            <p className="text-label text-ink-soft">Not sown yet.</p>
          )}
        </Card>
      ) : null}
      {sowings.map((sowing, i) => {
        const own = counts.filter((c) => c.sowing_id === sowing.id);
        const summary = summarizeSowing(sowing, own);
        return (
          <Card key={sowing.id} className="space-y-4">
            <header>
              <h2 className="text-body font-bold text-glacier-800">
                {sowing.tray ? sowing.tray : `Sowing ${i + 1}`} · sown {formatDay(sowing.sown_on)}
              </h2>
              <p className="text-label text-ink-soft">
                {sowing.seeds_sown} seeds{sowing.cells ? ` in ${sowing.cells} cells` : ""}
                {sowing.note ? ` · ${sowing.note}` : ""}
              </p>
            </header>
            <CountStepper sowing={sowing} totals={pickDailyTotals(own)} today={today} canCount={can("count.record")} />
            <GerminationCurve curve={summary.curve} t50={summary.metrics?.t50Coolbear.value ?? null} />
            <GerminationMetrics summary={summary} />
          </Card>
        );
      })}
      {sowings.length > 0 && canSow ? (
        adding ? (
          <Card>
            <h2 className="mb-3 text-body font-bold text-glacier-800">Another tray</h2>
            <SowingForm bag={bag} today={today} onDone={() => setAdding(false)} />
          </Card>
        ) : (
          <Button tone="quiet" onClick={() => setAdding(true)}>
            Sow another tray from this bag
          </Button>
        )
      ) : null}
    </section>
  );
}
