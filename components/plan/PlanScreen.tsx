"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb, type ProtocolRow } from "@/lib/client/db";
import { deletePlanItem } from "@/lib/client/repo";
import { vocabularyLabels } from "@/lib/schemas/words";
import { formatBagCode } from "@/lib/domain/bag-codes";
import type { PlanItem } from "@/lib/schemas/plan";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { Bag } from "@/lib/schemas/bag";
import type { Sowing } from "@/lib/schemas/sowing";
import type { Count } from "@/lib/schemas/count";
import { Button, buttonClass } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Chip } from "@/components/ui/Chip";
import { formatLongDay } from "@/components/bags/format-day";
import { useToday } from "@/components/bags/use-farm-rows";
import { describeSaveError } from "@/components/bags/save-error";
import { useMember } from "@/components/season/use-member";
import { describeMonthDay } from "@/components/settings/frost-date";
import { computePlanRow, findFrostDay, pickPlanProtocol, summarizeSpeciesHistory, type PlanRowResult } from "./plan-rows";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { countDownSeason } from "./timeline";
import { PlanItemForm } from "./PlanItemForm";
import { SeasonTimeline } from "./SeasonTimeline";
import { StartBagForm } from "./StartBagForm";
import { Notice } from "@/components/season/Notice";

/** The season a plan is made for: next year's once the summer is past. */
export function pickDefaultSeason(today: string): number {
  return Number(today.slice(0, 4)) + (Number(today.slice(5, 7)) >= 7 ? 1 : 0);
}

interface PlanSources {
  items: PlanItem[];
  lots: Lot[];
  protocols: ProtocolRow[];
  stores: Store[];
  bags: Bag[];
  sowings: Sowing[];
  counts: Count[];
}

export function PlanScreen() {
  const today = useToday();
  const { identity, can } = useMember();
  const [season, setSeason] = useState<number | null>(null);
  const [adding, setAdding] = useState(false);
  const rows = useLiveQuery(async (): Promise<PlanSources> => {
    const db = getLocalDb();
    const live = <T extends { deleted_at: string | null }>(r: T[]) => r.filter((x) => !x.deleted_at);
    const [items, lots, protocols, stores, bags, sowings, counts] = await Promise.all([
      db.plan_items.toArray(), db.lots.toArray(), db.protocols.toArray(), db.stores.toArray(), db.bags.toArray(), db.sowings.toArray(), db.counts.toArray(),
    ]);
    return { items: live(items), lots: live(lots), protocols: live(protocols), stores: live(stores), bags: live(bags), sowings: live(sowings), counts: live(counts) };
  }, []);

  const chosen = season ?? pickDefaultSeason(today);
  const seasons = useMemo(() => [...new Set([pickDefaultSeason(today), ...(rows?.items.map((i) => i.season) ?? [])])].sort(), [rows, today]);
  const lastFrost = identity?.farm.last_frost_date ?? null;

  const computed = useMemo(() => {
    if (!rows) return [];
    return rows.items
      .filter((i) => i.season === chosen)
      .map((item) => {
        const lot = rows.lots.find((l) => l.id === item.lot_id) ?? null;
        const protocol = pickPlanProtocol(item, lot, rows.protocols);
        const history = summarizeSpeciesHistory(item.species, rows);
        const result = computePlanRow({ item, lastFrost, today, protocol: protocol ? readProtocolRow(protocol) : null, lot, history });
        const bag = item.bag_id ? (rows.bags.find((b) => b.id === item.bag_id) ?? null) : null;
        return { item, lot, protocol, result, bag };
      })
      .sort((a, b) => (a.result.plan?.startBy ?? a.result.plan?.sowOn ?? "9999").localeCompare(b.result.plan?.startBy ?? b.result.plan?.sowOn ?? "9999") || a.item.species.localeCompare(b.item.species));
  }, [rows, chosen, lastFrost, today]);

  const countdown = useMemo(
    () =>
      countDownSeason(
        computed
          .filter((c) => c.result.plan)
          .map((c) => ({
            id: c.item.id,
            label: c.item.species,
            sowOn: c.result.plan!.sowOn,
            phases: c.result.plan!.phases,
            // A discarded bag no longer carries the row's cold: the row reads as not started again.
            bag: c.bag && !c.bag.discarded_on ? { startedOn: c.bag.start_date, outOn: c.bag.pulled_on ?? c.bag.sown_on } : null,
          })),
        findFrostDay(chosen, lastFrost),
        today,
      ),
    [computed, chosen, lastFrost, today],
  );
  const canPlan = can("plan.upsert");

  return (
    <div className="mx-auto max-w-xl space-y-4 px-4 pb-28 pt-4 lg:max-w-6xl">
      <PageHeader
        title="Season plan"
        subtitle={lastFrost ? `Average last frost ${describeMonthDay(lastFrost)}${identity?.farm.location_note ? ` · ${identity.farm.location_note}` : ""}` : "Set the farm's last frost date to date the plan."}
        action={canPlan && !adding ? <Button onClick={() => setAdding(true)}>Add</Button> : null}
      />
      {!lastFrost && identity ? (
        <Card className="border-wheat-600">
          <p className="text-label">
            Rows sown relative to the frost need the farm&apos;s average last spring frost date.{" "}
            <Link href="/settings" className="font-semibold text-glacier-700 underline">
              Set it in Settings
            </Link>
            .
          </p>
        </Card>
      ) : null}
      <div role="group" aria-label="Season" className="flex flex-wrap gap-2">
        {seasons.map((s) => (
          <Chip key={s} pressed={s === chosen} onClick={() => setSeason(s)}>
            {s}
          </Chip>
        ))}
      </div>
      {adding && rows ? (
        <Card>
          <h2 className="mb-3 text-body font-bold text-glacier-800">Add a species to {chosen}</h2>
          <PlanItemForm season={chosen} lots={rows.lots} protocols={rows.protocols} onDone={() => setAdding(false)} />
        </Card>
      ) : null}
      {rows === undefined ? <p className="text-ink-soft">Opening the plan on this phone…</p> : null}
      {countdown ? (
        <Card>
          <h2 className="mb-1 text-body font-bold text-glacier-800">{countdown.anchorKind === "frost" ? "Countdown to the frost" : "Countdown to sowing"}</h2>
          <SeasonTimeline countdown={countdown} today={today} />
        </Card>
      ) : null}
      {rows && computed.length === 0 ? (
        <Card>
          <p>Nothing planned for {chosen} yet. Add each species with the plants you want and when it should be sown; Rimebook works out when each bag must go in and how much seed it takes.</p>
        </Card>
      ) : null}
      <ul className="space-y-3 lg:grid lg:grid-cols-2 lg:gap-4 lg:space-y-0">
        {computed.map((c) => (
          <li key={c.item.id}>
            <PlanRowCard
              {...c}
              today={today}
              canPlan={canPlan}
              canStart={can("bag.create")}
              rows={rows!}
              season={chosen}
            />
          </li>
        ))}
      </ul>
    </div>
  );
}

function PlanRowCard({
  item,
  lot,
  protocol,
  result,
  bag,
  today,
  canPlan,
  canStart,
  rows,
  season,
}: {
  item: PlanItem;
  lot: Lot | null;
  protocol: ProtocolRow | null;
  result: PlanRowResult;
  bag: Bag | null;
  today: string;
  canPlan: boolean;
  canStart: boolean;
  rows: PlanSources;
  season: number;
}) {
  const [mode, setMode] = useState<"view" | "edit" | "start">("view");
  const [error, setError] = useState<string | null>(null);
  const plan = result.plan;
  const rule = item.sowing_rule;

  async function remove() {
    if (!window.confirm(`Take ${item.species} out of the ${season} plan?`)) return;
    try {
      await deletePlanItem(item.id);
    } catch (e) {
      setError(describeSaveError(e));
    }
  }

  if (mode === "edit") {
    return (
      <Card>
        <PlanItemForm item={item} season={season} lots={rows.lots} protocols={rows.protocols} onDone={() => setMode("view")} />
      </Card>
    );
  }
  return (
    <Card className="space-y-3">
      <header className="flex items-start justify-between gap-2">
        <div>
          <h2 className="text-body font-bold text-ink">{item.species}</h2>
          <p className="text-label text-ink-soft">
            {item.target_plants} plants · {rule.anchor === "frost" ? `${rule.weeks === 0 ? "at" : `${Math.abs(rule.weeks)} week${Math.abs(rule.weeks) === 1 ? "" : "s"} ${rule.weeks < 0 ? "before" : "after"}`} the last frost` : "on a set date"} · {rule.place === "indoor" ? "indoors" : "outdoors"}
          </p>
        </div>
        {bag ? (
          <Link href={`/bags/view?id=${encodeURIComponent(bag.id)}`} className="shrink-0 rounded-full bg-moss-100 px-3 py-1 text-label font-semibold text-moss-700">
            ✓ bag {formatBagCode(bag.code)}
          </Link>
        ) : null}
      </header>
      {result.problem ? (
        <p role="alert" className="rounded-xl bg-wheat-100 p-3 text-label text-wheat-700">
          {result.problem}
        </p>
      ) : null}
      {plan ? (
        <dl className="grid grid-cols-2 gap-2">
          <div className="rounded-xl bg-rime-50 p-2">
            <dt className="text-label text-ink-soft">Sow</dt>
            <dd className="font-bold text-glacier-800">{formatLongDay(plan.sowOn)}</dd>
          </div>
          <div className="rounded-xl bg-rime-50 p-2">
            <dt className="text-label text-ink-soft">Bag in by</dt>
            <dd className="font-bold text-glacier-800">{plan.startBy ? formatLongDay(plan.startBy) : "no pretreatment"}</dd>
          </div>
          {plan.phases.map((p) => (
            <div key={`${p.kind}-${p.startBy}`} className="col-span-2 text-label text-ink">
              <dt className="inline">{vocabularyLabels.phaseKind[p.kind]}: </dt>
              <dd className="inline">
                start by {formatLongDay(p.startBy)}
                {p.startFrom && p.startFrom < p.startBy ? ` (not before ${formatLongDay(p.startFrom)})` : ""}
              </dd>
            </div>
          ))}
          <div className="col-span-2 rounded-xl bg-rime-50 p-2">
            <dt className="text-label text-ink-soft">Seeds needed</dt>
            <dd className="font-bold text-glacier-800">{result.seedsNeeded ?? "—"}</dd>
            <dd className="text-label text-ink-soft">
              Germination {result.germinationBasis}; survival {result.survivalBasis}.
            </dd>
            <dd className="text-label text-ink">
              {lot ? (
                <>
                  Lot: {lot.source ?? lot.species}
                  {lot.year ? ` ${lot.year}` : ""} · {lot.quantity ?? "unknown"} seeds
                  {result.lotHasEnough === true ? <span className="font-semibold text-moss-700"> · enough</span> : null}
                  {result.lotHasEnough === false ? <span className="font-semibold text-ember-700"> · not enough</span> : null}
                </>
              ) : (
                "No lot chosen."
              )}
            </dd>
          </div>
        </dl>
      ) : null}
      {result.warnings.length ? (
        <ul className="space-y-1">
          {result.warnings.map((w) => (
            <li key={w.code + w.message} className={`rounded-lg px-3 py-2 text-label ${w.code === "lot_too_small" || w.code === "start_by_passed" ? "bg-ember-100 text-ember-700" : "bg-wheat-100 text-wheat-700"}`}>
              {w.message}
            </li>
          ))}
        </ul>
      ) : null}
      {protocol ? <p className="text-label text-ink-soft">Protocol: {protocol.species}{protocol.is_farm_own ? " (farm's own)" : ""}</p> : null}
      <Notice>{error}</Notice>
      {mode === "start" && lot ? (
        <StartBagForm
          item={item}
          lot={lot}
          protocol={protocol}
          stores={rows.stores}
          codes={rows.bags.map((b) => b.code)}
          seedsNeeded={result.seedsNeeded}
          today={today}
          onDone={() => setMode("view")}
        />
      ) : (
        <div className="grid grid-cols-2 gap-2">
          {canStart && !bag ? (
            lot ? (
              <Button className="col-span-2" onClick={() => setMode("start")}>
                Start this bag
              </Button>
            ) : (
              <span className="col-span-2 text-label text-ink-soft">Choose a lot to start a bag.</span>
            )
          ) : null}
          {canPlan ? (
            <>
              <Button tone="quiet" onClick={() => setMode("edit")}>
                Edit
              </Button>
              <Button tone="quiet" onClick={() => void remove()}>
                Remove
              </Button>
            </>
          ) : null}
          {bag ? (
            <Link href={`/bags/view?id=${encodeURIComponent(bag.id)}`} className={buttonClass("secondary", "md", "col-span-2")}>
              Open bag
            </Link>
          ) : null}
        </div>
      )}
    </Card>
  );
}
