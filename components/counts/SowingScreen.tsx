"use client";

import Link from "next/link";
import { useSearchParams } from "next/navigation";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { formatBagCode } from "@/lib/domain";
import { Card, PageHeader } from "@/components/ui/Card";
import { formatShortDay as formatDay } from "@/components/bags/format-day";
import { SowingPanel } from "./SowingPanel";

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
    <main className="mx-auto max-w-xl space-y-4 px-4 pb-28 pt-4">
      <Link href="/sowing" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← Bags to sow and count
      </Link>
      <PageHeader title={head?.bag ? `Bag ${formatBagCode(head.bag.code)}` : "Sowing and counts"} subtitle={head?.lot ? `${head.lot.species}${head.lot.common_name ? ` · ${head.lot.common_name}` : ""}` : undefined} />
      <SowingPanel bagId={bagId} />
    </main>
  );
}

function BagPicker() {
  const rows = useLiveQuery(async () => {
    const db = getLocalDb();
    const bags = (await db.bags.toArray()).filter((b) => !b.deleted_at && !b.discarded_on && (b.pulled_on || b.sown_on));
    const lots = await db.lots.bulkGet([...new Set(bags.map((b) => b.lot_id))]);
    return bags
      .map((b) => ({ bag: b, lot: lots.find((l) => l?.id === b.lot_id) ?? null }))
      .sort((a, b) => Number(!!a.bag.sown_on) - Number(!!b.bag.sown_on) || (b.bag.sown_on ?? b.bag.pulled_on ?? "").localeCompare(a.bag.sown_on ?? a.bag.pulled_on ?? ""));
  }, []);
  return (
    <main className="mx-auto max-w-xl space-y-4 px-4 pb-28 pt-4">
      <PageHeader title="Sowing and counts" subtitle="Pulled bags waiting to be sown, then the trays being counted." />
      {rows === undefined ? <p className="text-ink-soft">Opening…</p> : null}
      {rows?.length === 0 ? (
        <Card>
          <p>No pulled bags yet. Pull a bag from its check sheet when its first roots show, then sow and count it here.</p>
        </Card>
      ) : null}
      <ul className="space-y-2">
        {rows?.map(({ bag, lot }) => (
          <li key={bag.id}>
            <Link href={`/sowing?bag=${bag.id}`} className="flex min-h-tap items-center justify-between gap-3 rounded-card border border-rime-200 bg-white p-4 hover:border-glacier-500">
              <span>
                <span className="block font-mono font-bold tracking-wider">{formatBagCode(bag.code)}</span>
                <span className="block text-label text-ink-soft">{lot?.species ?? "Unknown lot"}</span>
              </span>
              <span className={`rounded-full px-3 py-1 text-label font-semibold ${bag.sown_on ? "bg-moss-100 text-moss-700" : "bg-wheat-100 text-wheat-700"}`}>
                {bag.sown_on ? `✿ sown ${formatDay(bag.sown_on)}` : `↑ pulled ${formatDay(bag.pulled_on!)} · to sow`}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </main>
  );
}
