"use client";

import dynamic from "next/dynamic";
import Link from "next/link";
import { useSearchParams } from "next/navigation";
import { useMemo, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { usePhotoSrc } from "@/lib/client/hooks";
import { getLocalDb, type PendingPhoto } from "@/lib/client/db";
import { loadStoreReadings } from "@/lib/client/fridge-reads";
import type { Check } from "@/lib/schemas/check";
import type { Photo } from "@/lib/schemas/photo";
import { vocabularyLabels } from "@/lib/schemas/words";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { measureColdExposure, type ColdExposure } from "@/lib/domain/cold-exposure";
import { addDaysToIsoDay } from "@/lib/domain/dates";
import { prepareStoreReadings, type EffectiveWindow } from "@/lib/domain/effective-window";
import { scheduleBagCheck } from "@/lib/domain/round";
import { adviseOnCheck } from "@/lib/domain/schedule";
import { formatTemperature } from "@/lib/domain/units";
import { WorkedOut } from "@/components/ui/WorkedOut";
import { buttonClass } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { StateBadge } from "@/components/ui/StateBadge";
import { pickBagCautions } from "@/components/check/bag-cautions";
import { useMember } from "@/components/season/use-member";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { BagActions } from "./BagActions";
import { BagCautions } from "./BagCautions";
import { buildBagRows, findEffectiveBagWindow, toTemperatureReadings } from "@/lib/domain/rows/bag-rows";
import { cadenceFor, toRoundBag } from "@/lib/domain/rows/round-input";
import { describeBagHistory } from "./bag-history";
import { formatLongDay, formatShortDay, formatStamp } from "./format-day";
import { useToday } from "./use-farm-rows";
import { WindowBar } from "./WindowBar";
import { useFarmRoots } from "@/components/learn/use-farm-roots";

// Only for a pulled or sown bag (its sowing form with react-hook-form and zod): loaded then, precached for offline.
const SowingPanel = dynamic(() => import("@/components/counts/SowingPanel").then((m) => m.SowingPanel), { ssr: false });

// One bag, read from the phone store (works with no signal). The id travels in the query (?id=…) so the page
// itself is one static route the service worker can keep.

async function loadBagDetail(id: string) {
  const db = getLocalDb();
  const bag = await db.bags.get(id);
  if (!bag || bag.deleted_at) return null;
  const lot = (await db.lots.get(bag.lot_id)) ?? null;
  const protocolId = bag.protocol_id ?? lot?.protocol_id ?? null;
  const [protocol, stores, protocols, checks, photos, pendingPhotos, audit, members] = await Promise.all([
    protocolId ? db.protocols.get(protocolId) : undefined,
    db.stores.toArray(),
    db.protocols.toArray(),
    db.checks.where("bag_id").equals(id).toArray(),
    db.photos.where("bag_id").equals(id).toArray(),
    db.pending_photos.where("bag_id").equals(id).toArray(),
    db.audit_log.where("[table_name+row_id]").equals(["bags", id]).toArray(),
    db.memberships.toArray(),
  ]);
  const store = bag.store_id ? (stores.find((s) => s.id === bag.store_id) ?? null) : null;
  // The store's readings since the bag started (one read of the store's time index), as Today reads them.
  const readings = store && bag.start_date ? await loadStoreReadings(db, store.id, addDaysToIsoDay(bag.start_date, -2)) : [];
  return {
    bag,
    lot,
    protocol: protocol && !protocol.deleted_at ? protocol : null,
    store,
    stores: stores.filter((s) => !s.deleted_at),
    protocols,
    checks: checks.filter((c) => !c.deleted_at).sort((a, b) => b.checked_at.localeCompare(a.checked_at)),
    photos: photos.filter((p) => !p.deleted_at),
    pendingPhotos,
    audit,
    members,
    readings,
  };
}
type BagDetailData = NonNullable<Awaited<ReturnType<typeof loadBagDetail>>>;

export function BagDetail() {
  const id = useSearchParams().get("id");
  const data = useLiveQuery(async () => (id ? loadBagDetail(id) : null), [id]);
  if (!id) return <Missing text="No bag was chosen." />;
  if (data === undefined) return <p className="p-4 text-body text-ink-soft">Opening the bag on this phone…</p>;
  if (data === null) return <Missing text="This bag is not on this phone. It may have been removed, or the phone has not synced it yet." />;
  return <BagDetailView data={data} />;
}

function Missing({ text }: { text: string }) {
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-3 px-4 pt-6">
      <p className="text-body">{text}</p>
      <Link href="/bags" className={buttonClass("secondary", "md")}>
        All bags
      </Link>
    </div>
  );
}

function BagDetailView({ data }: { data: BagDetailData }) {
  const { bag, lot, protocol, store, stores, checks } = data;
  const today = useToday();
  const { can, identity } = useMember();
  const [nowMs] = useState(() => Date.now());
  const farmRoots = useFarmRoots(lot?.species, bag.start_date ?? null);
  // The same row, effective window (moved by cold lost in the store) and next check as Today, the bags table,
  // the labels and the digest: all from lib/domain.
  const { row, effective, cold } = useMemo(() => {
    const clock = { asOf: nowMs };
    const row = buildBagRows({ bags: [bag], lots: lot ? [lot] : [], protocols: protocol ? [protocol] : [], stores, readings: data.readings }, today, clock)[0];
    const readings = toTemperatureReadings(data.readings);
    const effective = findEffectiveBagWindow(bag, protocol, prepareStoreReadings(readings), today, { ...clock, storeKind: store?.kind ?? null });
    // The hour-by-hour story behind it, over the same span and band, so its lost days are the window's.
    const span = effective.span;
    const cold = span && store ? measureColdExposure(readings, { band: effective.band, from: new Date(span.from).toISOString(), to: new Date(span.to).toISOString() }) : null;
    return { row, effective, cold };
  }, [bag, lot, protocol, store, stores, data.readings, today, nowMs]);
  const window = effective.planned;
  const state = row.state;
  const { next } = scheduleBagCheck({ ...toRoundBag(row, bag, checks[0] ?? null), rootsWatchFrom: farmRoots?.watchFrom ?? null }, today, cadenceFor(identity?.farm.weekly_check_days));
  const inCold = state === "chilling" || state === "window_open" || state === "overdue";
  const proto = protocol ? readProtocolRow(protocol) : null;
  const shifted = effective.shifted ? effective.window : null;
  const cautions = pickBagCautions({
    species: lot?.species ?? "",
    toxicSeed: protocol?.toxic_seed ?? null,
    medicinal: protocol?.medicinal,
    treated: lot?.treated,
    storeHoldsFood: store?.holds_food,
  });
  const memberNames = new Map(data.members.map((m) => [m.user_id, m.name ?? m.email ?? "A member"]));

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <Link href="/bags" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← All bags
      </Link>

      <header className="space-y-2">
        <div className="flex items-start justify-between gap-3">
          <h1 className="font-mono text-display font-bold tracking-wider text-glacier-800">
            <span className="sr-only">Bag </span>
            {formatBagCode(bag.code)}
          </h1>
          <StateBadge state={state} sprouts={checks[0]?.sprouts} />
        </div>
        <p className="text-title">
          <i>{lot?.species ?? "Unknown lot"}</i>
          {lot?.common_name ? <span className="text-body text-ink-soft"> · {lot.common_name}</span> : null}
        </p>
        <dl className="grid grid-cols-2 gap-x-4 gap-y-2 rounded-card bg-paper p-3 text-label shadow-sm">
          <Fact term="Lot">{lot ? [lot.source, lot.year].filter(Boolean).join(", ") || "—" : "—"}</Fact>
          <Fact term="Protocol">
            {protocol ? (
              <Link href={`/protocols/view?id=${encodeURIComponent(protocol.id)}`} className="inline-flex min-h-tap items-center text-glacier-700 underline underline-offset-4">
                {protocol.species}
                {protocol.is_farm_own ? " (farm's own)" : " (published sources)"}
              </Link>
            ) : (
              "None"
            )}
          </Fact>
          <Fact term="Cold store">{store ? store.name : "Not in a store"}</Fact>
          <Fact term="Box">{bag.box ?? "—"}</Fact>
          <Fact term="Medium">{vocabularyLabels.medium[bag.medium]}</Fact>
          <Fact term="Seeds">{bag.seed_count ?? "—"}</Fact>
          <Fact term={bag.start_date ? "Started" : "Planned start"}>
            {bag.start_date ? formatLongDay(bag.start_date) : bag.planned_start_date ? formatLongDay(bag.planned_start_date) : "—"}
          </Fact>
          {bag.pulled_on ? <Fact term="Pulled">{formatLongDay(bag.pulled_on)}</Fact> : null}
          {bag.sown_on ? <Fact term="Sown">{formatLongDay(bag.sown_on)}</Fact> : null}
          {bag.discarded_on ? (
            <Fact term="Discarded">
              {formatLongDay(bag.discarded_on)}
              {bag.discard_reason ? ` — ${bag.discard_reason}` : ""}
            </Fact>
          ) : null}
        </dl>
        {bag.note ? <p className="rounded-card bg-rime-100 p-3 text-body">{bag.note}</p> : null}
      </header>

      <Card className="space-y-3">
        <h2 className="text-body font-bold text-glacier-800">Pull window</h2>
        {window && (bag.start_date || bag.planned_start_date) ? (
          <WindowBar
            startedOn={bag.start_date ?? bag.planned_start_date!}
            opensOn={window.opensOn}
            closesOn={window.closesOn}
            today={bag.pulled_on ?? bag.discarded_on ?? today}
            markerLabel={bag.pulled_on ? "Pulled" : bag.discarded_on ? "Discarded" : "Today"}
            shifted={shifted ? { opensOn: shifted.opensOn, closesOn: shifted.closesOn } : null}
          />
        ) : (
          <p className="text-label text-ink-soft">{proto?.noColdReason || "No pull window: this bag has no protocol window or no start date yet."}</p>
        )}
        {next ? (
          <p className="text-body" data-testid="bag-next-check">
            <span className="font-semibold">{next.on <= today ? "Check today" : `Next check ${formatShortDay(next.on)}`}</span>
            {next.on < today ? ` (due since ${formatShortDay(next.on)})` : ""}: {next.note}
          </p>
        ) : null}
        {inCold && farmRoots?.line ? (
          <p className="text-label text-glacier-800" data-testid="farm-roots-line">
            {farmRoots.line}
          </p>
        ) : null}
        {window?.sourcesDisagree ? (
          <p className="text-label text-ink-soft">Sources disagree: planned for the earliest day; check daily from then and pull when the first roots show (common practice).</p>
        ) : null}
      </Card>

      {bag.start_date ? <ColdDays data={data} cold={cold} effective={effective} /> : null}

      <Card className="space-y-3">
        <h2 className="text-body font-bold text-glacier-800">What to do</h2>
        <BagActions
          bag={bag}
          state={state}
          stores={stores}
          today={today}
          can={{
            check: can("check.record"),
            pull: can("bag.pull"),
            discard: can("bag.discard"),
            edit: can("bag.update"),
            sow: can("sowing.record"),
          }}
        />
        <Link href={`/labels?ids=${encodeURIComponent(bag.id)}`} className={`${buttonClass("quiet", "md")} w-full`}>
          Print label
        </Link>
      </Card>

      <BagCautions cautions={cautions} />

      {state === "pulled" || state === "sown" ? <SowingPanel bagId={bag.id} /> : null}

      <CheckTimeline checks={checks} photos={data.photos} pending={data.pendingPhotos} memberNames={memberNames} />

      <History data={data} memberNames={memberNames} />
    </div>
  );
}

function Fact({ term, children }: { term: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="font-semibold text-ink-soft">{term}</dt>
      <dd className="text-body text-ink">{children}</dd>
    </div>
  );
}

function ColdDays({
  data,
  cold,
  effective,
}: {
  data: BagDetailData;
  cold: ColdExposure | null;
  effective: EffectiveWindow;
}) {
  const { store } = data;
  const e = cold;
  const shifted = effective.shifted ? effective.window : null;
  return (
    <Card className="space-y-2">
      <h2 className="text-body font-bold text-glacier-800">Effective cold days</h2>
      {!store ? (
        <p className="text-label text-ink-soft">The bag is not in a cold store, so there are no readings to count.</p>
      ) : !e ? (
        <p className="text-label text-ink-soft">{effective.reason}</p>
      ) : (
        <>
          <p className="text-body">
            <span className="text-title font-bold">{e.effectiveColdDays.toFixed(1)}</span> of {e.calendarDays.toFixed(1)} days in {store.name} were between{" "}
            {formatTemperature(e.band.minC)} and {formatTemperature(e.band.maxC)}.
          </p>
          {effective.lostDays > 0 ? (
            <p className="text-body text-wheat-700">
              About {effective.lostDays === 1 ? "1 day of cold was" : `${effective.lostDays} days of cold were`} lost
              {shifted
                ? `: the window moves to ${formatShortDay(shifted.opensOn)}${shifted.closesOn ? `–${formatShortDay(shifted.closesOn)}` : ""}.`
                : "."}
            </p>
          ) : effective.basis === "kept_cold" || effective.basis === "no_readings" ? (
            <p className="text-label text-moss-700">No cold lost: the window stays as planned.</p>
          ) : (
            <p className="text-label text-ink-soft">{effective.reason}</p>
          )}
          {e.hoursFrozen > 0 && store.kind !== "freezer" ? (
            <p className="text-label text-ink-soft">The store went below 0 °C for {e.hoursFrozen.toFixed(0)} h; frozen time is a different treatment and is not counted as cold here.</p>
          ) : null}
          {store.kind === "freezer" ? (
            <p className="text-label text-ink-soft">This is a freezer: a different treatment from a fridge, not more cold.</p>
          ) : null}
          <WorkedOut testId="cold-worked-out">
            <ul className="list-disc space-y-1 pl-5">
              {data.readings.length === 0 ? <li>This store has no readings on this phone since the bag started.</li> : null}
              {e.assumptions.map((a) => (
                <li key={a}>{a}</li>
              ))}
              {e.gaps.length === 0 ? (
                <li>Had the readings stopped for more than 6 hours, that time would be counted as cold, as a working fridge stays in its band.</li>
              ) : null}
            </ul>
          </WorkedOut>
          <Link href={`/stores/view?id=${encodeURIComponent(store.id)}`} className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700 underline underline-offset-4">
            {store.name}: readings and chart
          </Link>
        </>
      )}
    </Card>
  );
}

/** One photo: the phone's own copy while it waits to upload, the farm's copy after (usePhotoSrc decides). */
function Thumb({ id, waiting, refused }: { id: string; waiting: boolean; refused: boolean }) {
  const src = usePhotoSrc(id);
  return (
    <figure>
      {src ? (
        <a href={src} target="_blank" rel="noreferrer" className="block">
          {/* eslint-disable-next-line @next/next/no-img-element */}
          <img src={src} alt={waiting ? "Photo waiting to upload" : "Photo from a check"} loading="lazy" className="h-20 w-20 rounded-xl bg-rime-200 object-cover" />
        </a>
      ) : (
        <div className="h-20 w-20 rounded-xl bg-rime-200" />
      )}
      {waiting ? <figcaption className="mt-0.5 text-center text-[0.8125rem] text-ink-soft">{refused ? "Not uploaded" : "Waiting"}</figcaption> : null}
    </figure>
  );
}

function Thumbs({ photos, pending }: { photos: readonly Photo[]; pending: readonly PendingPhoto[] }) {
  if (!photos.length && !pending.length) return null;
  return (
    <div className="flex flex-wrap gap-2">
      {photos.map((p) => (
        <Thumb key={p.id} id={p.id} waiting={false} refused={false} />
      ))}
      {pending.filter((p) => !photos.some((x) => x.id === p.id)).map((p) => (
        <Thumb key={p.id} id={p.id} waiting refused={Boolean(p.error)} />
      ))}
    </div>
  );
}

function Finding({ label, value, good }: { label: string; value: string; good: boolean }) {
  return (
    <span className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-label font-semibold ${good ? "bg-moss-100 text-moss-700" : "bg-wheat-100 text-wheat-700"}`}>
      <span aria-hidden="true">{good ? "✓" : "•"}</span>
      <span className="sr-only">{label}: </span>
      {value}
    </span>
  );
}

function CheckTimeline({
  checks,
  photos,
  pending,
  memberNames,
}: {
  checks: readonly Check[];
  photos: readonly Photo[];
  pending: readonly PendingPhoto[];
  memberNames: ReadonlyMap<string, string>;
}) {
  const checkIds = new Set(checks.map((c) => c.id));
  const loosePhotos = photos.filter((p) => !p.check_id || !checkIds.has(p.check_id));
  const loosePending = pending.filter((p) => !p.check_id || !checkIds.has(p.check_id));
  return (
    <section aria-labelledby="checks-heading" className="space-y-2">
      <h2 id="checks-heading" className="text-body font-bold text-glacier-800">
        Checks <span className="font-normal text-ink-soft">({checks.length})</span>
      </h2>
      {checks.length === 0 ? <p className="text-label text-ink-soft">No checks yet.</p> : null}
      <ol className="relative space-y-3 border-l-2 border-rime-300 pl-4">
        {checks.map((c) => {
          const advice = adviseOnCheck(c);
          return (
            <li key={c.id} className="relative">
              <span className={`absolute -left-[1.4rem] top-1.5 h-3 w-3 rounded-full ${advice.level === "fine" ? "bg-moss-600" : advice.level === "attention" ? "bg-wheat-600" : "bg-ember-600"}`} aria-hidden="true" />
              <Card className="space-y-2 p-3">
                <p className="text-label text-ink-soft">
                  <time dateTime={c.checked_at}>{formatStamp(c.checked_at)}</time>
                  {c.checked_by ? ` · ${memberNames.get(c.checked_by) ?? "A member"}` : " · this phone, not synced yet"}
                </p>
                <div className="flex flex-wrap gap-1.5">
                  <Finding label="Moisture" value={vocabularyLabels.moisture[c.moisture]} good={c.moisture === "damp"} />
                  <Finding label="Mould" value={c.mould === "clean" ? "Clean" : `Mould: ${vocabularyLabels.mould[c.mould].toLowerCase()}`} good={c.mould === "clean"} />
                  <Finding label="Sprouts" value={c.sprouts === "none" ? "No sprouts" : vocabularyLabels.sprouts[c.sprouts]} good={c.sprouts === "none"} />
                </div>
                {advice.level !== "fine" ? <p className="text-label font-semibold">{advice.headline}</p> : null}
                {c.actions?.length ? (
                  <p className="text-label">
                    <span className="font-semibold">Done: </span>
                    {c.actions.map((a) => vocabularyLabels.checkAction[a]).join(", ")}
                  </p>
                ) : null}
                {c.temperature_c !== null && c.temperature_c !== undefined ? <p className="text-label">Store at {formatTemperature(c.temperature_c)}</p> : null}
                {c.note ? <p className="text-body">{c.note}</p> : null}
                <Thumbs photos={photos.filter((p) => p.check_id === c.id)} pending={pending.filter((p) => p.check_id === c.id)} />
              </Card>
            </li>
          );
        })}
      </ol>
      {loosePhotos.length || loosePending.length ? (
        <div className="space-y-1">
          <h3 className="text-label font-semibold">Other photos</h3>
          <Thumbs photos={loosePhotos} pending={loosePending} />
        </div>
      ) : null}
    </section>
  );
}

function History({ data, memberNames }: { data: BagDetailData; memberNames: ReadonlyMap<string, string> }) {
  const lines = describeBagHistory(data.audit, {
    stores: new Map(data.stores.map((s) => [s.id, s.name])),
    protocols: new Map(data.protocols.map((p) => [p.id, p.species])),
    members: memberNames,
  });
  return (
    <section aria-labelledby="history-heading" className="space-y-2">
      <h2 id="history-heading" className="text-body font-bold text-glacier-800">
        History of edits
      </h2>
      {lines.length === 0 ? (
        <p className="text-label text-ink-soft">No edits recorded since the bag was set up{data.bag.created_at ? ` on ${formatStamp(data.bag.created_at)}` : ""}.</p>
      ) : (
        <ul className="divide-y divide-rime-200 rounded-card bg-paper text-label shadow-sm">
          {lines.map((l) => (
            <li key={l.id} className="p-3">
              <p>
                <span className="font-semibold">{l.field}</span>: {l.from} <span aria-label="changed to">→</span> {l.to}
              </p>
              <p className="text-ink-soft">
                {l.who} · <time dateTime={l.at}>{formatStamp(l.at)}</time>
              </p>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
