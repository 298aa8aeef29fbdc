"use client";

import Link from "next/link";
import { useSearchParams } from "next/navigation";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { Card, PageHeader } from "@/components/ui/Card";
import { formatShortDay as formatDay } from "@/components/bags/format-day";
import { SowingPanel } from "./SowingPanel";
import { loadLastChecks } from "@/lib/client/fridge-reads";
import { formatIsoDay } from "@/lib/domain/dates";
import { buildSowQueueFromRows, isWaitingToSow } from "@/lib/domain/rows/round-input";

/** /sowing?bag=… : one bag's sowing and counts; without a bag, the bags ready to sow or being counted. */
export function SowingScreen() {
  const bagId = useSearchParams().get("bag");
  return bagId ? <OneBag bagId={bagId} /> : <BagPicker />;
}

function OneBag({ bagId }: { bagId: string }) {
  const head = useLiveQuery(async () => {
    const db = getLocalDb();
    const bag = await db.bags.get(bagId);
    const lot = bag ? await db.lots.get(bag.lot_id) : undefined;
    return { bag: bag ?? null, lot: lot ?? null };
  }, [bagId]);
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <Link href="/sowing" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← Bags to sow and count
      </Link>
      <PageHeader title={head?.bag ? `Bag ${formatBagCode(head.bag.code)}` : "Sowing and counts"} subtitle={head?.lot ? `${head.lot.species}${head.lot.common_name ? ` · ${head.lot.common_name}` : ""}` : undefined} />
      <SowingPanel bagId={bagId} />
    </div>
  );
}

function BagPicker() {
  const rows = useLiveQuery(async () => {
    const db = getLocalDb();
    const bags = (await db.bags.toArray()).filter((b) => !b.deleted_at && !b.discarded_on && (b.pulled_on || b.sown_on));
    const lots = (await db.lots.bulkGet([...new Set(bags.map((b) => b.lot_id))])).filter((l) => l !== undefined);
    // Bags waiting to be sown: the same queue and rule as Today's "To sow" group, most urgent first.
    const waiting = bags.filter(isWaitingToSow);
    const queue = buildSowQueueFromRows({ bags: waiting, lots, stores: [] }, await loadLastChecks(db, waiting.map((b) => b.id)), formatIsoDay(new Date()), undefined, formatDay);
    const byId = new Map(bags.map((b) => [b.id, b]));
    const row = (b: (typeof bags)[number]) => ({ bag: b, lot: lots.find((l) => l.id === b.lot_id) ?? null });
    const sown = bags.filter((b) => b.sown_on).sort((a, b) => b.sown_on!.localeCompare(a.sown_on!));
    return [...queue.map((i) => ({ ...row(byId.get(i.bag.id)!), sow: i })), ...sown.map((b) => ({ ...row(b), sow: null }))];
  }, []);
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <PageHeader title="Sowing and counts" subtitle="Pulled bags waiting to be sown, then the trays being counted." />
      {rows === undefined ? <p className="text-ink-soft">Opening…</p> : null}
      {rows?.length === 0 ? (
        <Card>
          <p>No pulled bags yet. Pull a bag from its check sheet when its first roots show, then sow and count it here.</p>
        </Card>
      ) : null}
      <ul className="space-y-2">
        {rows?.map(({ bag, lot, sow }) => (
          <li key={bag.id}>
            <Link href={`/sowing?bag=${bag.id}`} className="flex min-h-tap items-center justify-between gap-3 rounded-card border border-rime-200 bg-paper p-4 hover:border-glacier-500">
              <span>
                <span className="block font-mono font-bold tracking-wider">{formatBagCode(bag.code)}</span>
                <span className="block text-label text-ink-soft">{lot?.species ?? "Unknown lot"}</span>
                {sow ? <span className={`block text-label ${sow.isLate || sow.sprouted ? "font-semibold text-ember-700" : "text-ink-soft"}`}>{sow.note}</span> : null}
              </span>
              <span className={`shrink-0 whitespace-nowrap rounded-full px-3 py-1 text-label font-semibold ${bag.sown_on ? "bg-moss-100 text-moss-700" : sow && (sow.isLate || sow.sprouted) ? "bg-ember-100 text-ember-700" : "bg-wheat-100 text-wheat-700"}`}>
                {bag.sown_on ? `✿ sown ${formatDay(bag.sown_on)}` : `↑ pulled ${formatDay(bag.pulled_on!)}`}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}
