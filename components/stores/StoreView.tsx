"use client";

import dynamic from "next/dynamic";
import Link from "next/link";
import { useMemo, useState } from "react";
import { useSearchParams } from "next/navigation";
import Dexie from "dexie";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { determineBagState } from "@/lib/domain/schedule";
import { formatTemperature } from "@/lib/domain/units";
import { vocabularyLabels } from "@/lib/schemas/words";
import { Button } from "@/components/ui/Button";
import { Segmented } from "@/components/ui/Segmented";
import { Card, PageHeader } from "@/components/ui/Card";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { StateBadge } from "@/components/ui/StateBadge";
import { useMember } from "@/components/season/use-member";
import { useToday } from "@/components/bags/use-farm-rows";
import { formatShortDay as formatDay, formatStamp } from "@/components/bags/format-day";
import { buildChartPoints, describeBand, describeStoreColdLoss, measureBagCold, measureStore } from "./store-metrics";
import { bandOfStoreKind } from "@/lib/domain/store-rules";
import { ReadingsChart } from "./ReadingsChart";
import { DryingPanel } from "@/components/learn/DryingPanel";
import { StoreDelete } from "./StoreDelete";
import { StoreGlyph } from "./StoreGlyph";

// Opened by a tap, so loaded then (react-hook-form and zod stay out of the first load; precached for offline).
const ReadingEntry = dynamic(() => import("./ReadingForm").then((m) => m.ReadingEntry), { ssr: false });
const ReadingsImport = dynamic(() => import("./ReadingsImport").then((m) => m.ReadingsImport), { ssr: false });
const StoreForm = dynamic(() => import("./StoreForm").then((m) => m.StoreForm), { ssr: false });

const ranges = [
  { key: "7", label: "7 days", days: 7 },
  { key: "30", label: "30 days", days: 30 },
  { key: "90", label: "90 days", days: 90 },
  { key: "all", label: "All", days: null },
] as const;

export function StoreView() {
  const id = useSearchParams().get("id") ?? "";
  const { identity, can, unit } = useMember();
  const [range, setRange] = useState<(typeof ranges)[number]["key"]>("30");
  const [editing, setEditing] = useState(false);
  const [panel, setPanel] = useState<"reading" | "import" | null>(null);
  const today = useToday();

  const data = useLiveQuery(async () => {
    const db = getLocalDb();
    const store = await db.stores.get(id);
    if (!store || store.deleted_at) return { store: null } as const;
    const readings = await db.readings.where("[store_id+taken_at]").between([id, Dexie.minKey], [id, Dexie.maxKey]).toArray();
    const bagsOfStore = await db.bags.where("store_id").equals(id).toArray();
    const bags = bagsOfStore.filter((b) => !b.deleted_at && !b.discarded_on && !b.sown_on);
    const lots = await db.lots.bulkGet([...new Set(bags.map((b) => b.lot_id))]);
    const protocolIds = [...new Set(bags.map((b) => b.protocol_id).filter((x): x is string => !!x))];
    const protocols = await db.protocols.bulkGet(protocolIds);
    return { store, readings, bags, bagsOfStore, lots: lots.filter((l) => !!l), protocols: protocols.filter((p) => !!p) } as const;
  }, [id]);

  const sinceMs = useMemo(() => {
    const days = ranges.find((r) => r.key === range)?.days ?? null;
    return days === null ? null : Date.now() - days * 86_400_000;
  }, [range]);

  if (!id) return <Missing text="No cold store was chosen." />;
  if (data === undefined) return <p className="p-4 text-ink-soft">Opening the store on this phone…</p>;
  if (!data.store) return <Missing text="This cold store is not on this phone. It may have been removed, or the phone has not synced it yet." />;

  const { store, readings, bags, bagsOfStore, lots, protocols } = data;
  const points = buildChartPoints(readings, unit, sinceMs);
  // Each kind of store against its own band; a cold frame follows the weather and is not judged.
  const ownBand = bandOfStoreKind(store.kind);
  const exposure = ownBand ? measureStore(readings, sinceMs, ownBand) : null;
  const band = ownBand ? describeBand(unit, ownBand) : null;
  const bagRows = bags
    .map((bag) => {
      const lot = lots.find((l) => l.id === bag.lot_id) ?? null;
      const protocolRow = protocols.find((p) => p.id === bag.protocol_id) ?? null;
      const cold = measureBagCold(bag, protocolRow, readings, store.kind, today);
      const state = determineBagState({ startedOn: bag.start_date, pulledOn: bag.pulled_on, sownOn: bag.sown_on, discardedOn: bag.discarded_on }, cold.shifted, today);
      return { bag, lot, cold, state };
    })
    .sort((a, b) => (a.bag.box ?? "").localeCompare(b.bag.box ?? "") || a.bag.code.localeCompare(b.bag.code));
  const coldLoss = describeStoreColdLoss(bagRows.map((r) => r.cold.lostDays));

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <Link href="/stores" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← All cold stores
      </Link>
      <PageHeader
        title={store.name}
        subtitle={`${vocabularyLabels.storeKind[store.kind]}${store.boxes.length ? ` · ${store.boxes.join(" · ")}` : ""}`}
        action={<StoreGlyph kind={store.kind} className="h-12 w-12 shrink-0" />}
      />
      {store.holds_food ? <Caution title="Shared with food">{cautionTexts.foodFridge}</Caution> : null}
      {store.notes ? <p className="text-label text-ink-soft">{store.notes}</p> : null}
      {can("store.update") ? (
        editing ? (
          <Card>
            <StoreForm store={store} onDone={() => setEditing(false)} />
          </Card>
        ) : (
          <Button tone="quiet" onClick={() => setEditing(true)}>
            Edit store
          </Button>
        )
      ) : null}

      <Card>
        <h2 className="text-body font-bold text-glacier-800">Readings</h2>
        <div className="mb-3 mt-2">
          <Segmented legend="Period" name="readings-period" options={ranges.map((r) => ({ value: r.key, label: r.label }))} value={range} onChange={setRange} />
        </div>
        <ReadingsChart points={points} band={band} unit={unit} excursions={exposure?.excursions ?? []} />
        {!ownBand && points.length ? (
          <p className="mt-2 text-label text-ink-soft">A cold frame follows the weather: its frosts and thaws are the treatment, so its readings are not held to a band.</p>
        ) : null}
        {exposure ? (
          <dl className="mt-3 grid grid-cols-3 gap-2 text-center">
            <Stat label="in the band" value={`${Math.round((100 * exposure.hoursInBand) / Math.max(exposure.totalHours, 1e-9))} %`} />
            <Stat label="too warm" value={`${exposure.hoursAbove.toFixed(0)} h`} />
            <Stat label="too cold" value={`${exposure.hoursBelow.toFixed(0)} h`} />
          </dl>
        ) : null}
        {exposure?.assumptions.length ? (
          <ul className="mt-2 list-disc pl-5 text-label text-ink-soft">
            {exposure.assumptions.map((a) => (
              <li key={a}>{a}</li>
            ))}
          </ul>
        ) : null}
      </Card>

      <Card>
        <div className="flex flex-wrap gap-2">
          {can("reading.record") ? (
            <Button tone={panel === "reading" ? "primary" : "secondary"} aria-expanded={panel === "reading"} onClick={() => setPanel(panel === "reading" ? null : "reading")}>
              Add a reading
            </Button>
          ) : null}
          {can("import.readings") ? (
            <Button tone={panel === "import" ? "primary" : "secondary"} aria-expanded={panel === "import"} onClick={() => setPanel(panel === "import" ? null : "import")}>
              Import logger CSV
            </Button>
          ) : null}
        </div>
        {!can("reading.record") && identity ? <p className="text-label text-ink-soft">Your role can read the chart; Helpers and up add readings.</p> : null}
        {panel === "reading" ? (
          <div className="mt-4">
            <ReadingEntry storeId={store.id} unit={unit} />
          </div>
        ) : null}
        {panel === "import" ? (
          <div className="mt-4">
            <ReadingsImport storeId={store.id} farmUnit={unit} timeZone={identity?.farm.timezone ?? "UTC"} />
          </div>
        ) : null}
      </Card>

      <Card>
        <h2 className="mb-2 text-body font-bold text-glacier-800">Excursions</h2>
        {!band ? (
          <p className="text-label text-ink-soft">Not judged: a cold frame has no band.</p>
        ) : !exposure || exposure.excursions.length === 0 ? (
          <p className="text-label text-ink-soft">None in this period: every reading was inside {band.band.min}–{band.band.max} °{unit}.</p>
        ) : (
          <ul className="space-y-2">
            {[...exposure.excursions].reverse().map((e) => (
              <li key={e.startAt} className="rounded-xl border-l-4 border-ember-600 bg-ember-100 p-3 text-label">
                <p className="font-semibold text-ember-700">
                  {e.kind === "above" ? "Too warm" : "Too cold"}: {e.kind === "above" ? "up to" : "down to"} {formatTemperature(e.peakC, unit)}
                </p>
                <p className="text-ink">
                  {formatStamp(e.startAt)} → {e.ongoing ? "still outside at the last reading" : formatStamp(e.endAt)} ({e.hours.toFixed(1)} h)
                </p>
              </li>
            ))}
          </ul>
        )}
      </Card>

      {store.kind !== "freezer" ? <DryingPanel storeId={store.id} /> : null}

      <Card>
        <h2 className="mb-1 text-body font-bold text-glacier-800">Bags in this store</h2>
        <p className="mb-3 text-label text-ink-soft">
          Effective cold days count only the time inside each protocol’s band; days lost to warm or frozen spells move the pull window later.
        </p>
        {coldLoss ? (
          <p className="mb-3 rounded-card border-l-4 border-wheat-600 bg-wheat-100 p-3 text-label font-semibold text-ink" data-testid="store-cold-loss">
            {coldLoss}
          </p>
        ) : null}
        {bagRows.length === 0 ? <p className="text-label text-ink-soft">No bags here now.</p> : null}
        <ul className="divide-y divide-rime-100">
          {bagRows.map(({ bag, lot, cold, state }) => (
            <li key={bag.id} className="py-3">
              <div className="flex items-center justify-between gap-2">
                <Link href={`/bags/view?id=${encodeURIComponent(bag.id)}`} className="inline-flex min-h-tap items-center font-mono text-body font-bold tracking-wider text-glacier-800 underline-offset-2 hover:underline">
                  {formatBagCode(bag.code)}
                </Link>
                <StateBadge state={state} />
              </div>
              <p className="text-label text-ink">
                {lot?.species ?? "Unknown lot"}
                {bag.box ? ` · ${bag.box}` : ""}
              </p>
              {cold.exposure ? (
                <p className="text-label text-ink-soft">
                  {cold.exposure.effectiveColdDays.toFixed(1)} cold days of {cold.exposure.calendarDays.toFixed(1)}
                  {cold.lostDays ? ` · ${cold.lostDays} day${cold.lostDays === 1 ? "" : "s"} lost` : " · none lost"}
                </p>
              ) : null}
              {/* Why nothing was measured; how far the lost cold moves the windows is said once above. */}
              {!cold.exposure ? <p className="text-label text-ink-soft">{cold.reason}</p> : null}
              {cold.window && cold.shifted ? (
                <p className="text-label text-ink">
                  Pull window {formatDay(cold.shifted.opensOn)}
                  {cold.shifted.closesOn ? `–${formatDay(cold.shifted.closesOn)}` : " on (no latest date)"}
                  {cold.shifted.opensOn !== cold.window.opensOn ? <span className="text-wheat-700"> (was {formatDay(cold.window.opensOn)})</span> : null}
                </p>
              ) : null}
            </li>
          ))}
        </ul>
      </Card>

      {can("store.delete") ? (
        <Card>
          <StoreDelete store={store} bagsOfStore={bagsOfStore} readingCount={readings.filter((r) => !r.deleted_at).length} />
        </Card>
      ) : null}
    </div>
  );
}

function Stat({ label, value }: { label: string; value: string }) {
  return (
    <div className="rounded-xl bg-rime-50 p-2">
      <dd className="text-title font-bold text-glacier-800">{value}</dd>
      <dt className="text-label text-ink-soft">{label}</dt>
    </div>
  );
}

function Missing({ text }: { text: string }) {
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 pt-4">
      <Card>
        <p>{text}</p>
        <Link href="/stores" className="mt-3 inline-flex min-h-tap items-center font-semibold text-glacier-700">
          ← All cold stores
        </Link>
      </Card>
    </div>
  );
}
