"use client";

import Link from "next/link";
import { useLiveQuery } from "dexie-react-hooks";
import { useClockLabel } from "@/lib/client/hooks";
import { lazyModule, useLazyModule } from "@/lib/client/lazy-module";
import { formatIsoDay } from "@/lib/domain/dates";
import { formatBagCode } from "@/lib/domain/bag-codes";
import type { RoundItem } from "@/lib/domain/round";
import { chooseSheetSteps, sheetStepLabels, type SheetTone } from "@/lib/domain/check-choice";
import type { PulledBagRow } from "@/lib/domain/rows/round-input";
import { allGoodFindings } from "@/lib/schemas/words";
import { buttonClass } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { StateBadge } from "@/components/ui/StateBadge";
import { formatShortDay } from "@/components/bags/format-day";
import type { SowItem } from "@/lib/domain/sow-queue";
import { ScanGlyph } from "./ScanGlyph";
import { FirstSteps } from "./FirstSteps";

// Today: the bags due for a check, worked out on the phone from the phone store (works with no signal).
// The frame and the Scan button paint first; the round's reads and computations (./round-data) load beside
// hydration, since nothing of the round can be drawn before the phone store answers anyway.
const roundData = lazyModule(() => import("./round-data"));

const longDay = new Intl.DateTimeFormat("en-GB", { weekday: "long", day: "numeric", month: "long" });
const formatLongDay = (now: Date) => longDay.format(now);

export function TodayRound() {
  const today = formatIsoDay(new Date());
  const compute = useLazyModule(roundData);
  const data = useLiveQuery(() => compute?.loadRound(today), [compute, today]);
  const dayLabel = useClockLabel(formatLongDay);

  return (
    <div className="space-y-5">
      {/* The heading is the fridge-side count itself ("4 bags due in 2 fridges"); the day follows it in pencil. */}
      <header className="border-l-4 border-glacier-600 pl-3">
        <h1 className="text-title font-bold leading-snug text-glacier-800" data-testid="round-headline">
          {data && data.fetched && data.firstSteps ? "A new farm: four steps to the first bag" : data && (data.fetched || data.bagCount > 0) ? data.headline : "Today\u2019s round"}
        </h1>
        <p className="min-h-[1.5em] text-label text-ink-soft">{dayLabel ? `Today\u2019s round · ${dayLabel}` : "Today\u2019s round"}</p>
        {data && !data.firstSteps && (data.fetched || data.bagCount > 0) ? (
          <p className="text-body text-ink-soft" data-testid="round-count">
            {data.countText}
          </p>
        ) : null}
      </header>

      {/* A farm with no bags yet has nothing to scan: its first steps come first instead. */}
      {data?.firstSteps ? null : (
        <Link href="/scan" className={buttonClass("primary", "xl", "w-full text-display")}>
          <ScanGlyph className="h-9 w-9" />
          Scan a bag
        </Link>
      )}

      {data === undefined ? <p className="text-ink-soft">Opening the round…</p> : null}

      {data && data.fetched && data.firstSteps ? <FirstSteps steps={data.firstSteps} /> : null}

      {data && data.round.counts.due + data.sowQueue.length > 0 ? (
        <ul className="flex flex-wrap gap-2" aria-label="Due today by reason">
          {data.chips.map((s) => (
            <li key={s.kind} className={`rounded-md border px-2.5 py-1 text-label font-semibold ${chipLook[s.tone].frame}`} data-tone={s.tone}>
              {chipLook[s.tone].mark ? <span aria-hidden="true">{chipLook[s.tone].mark}</span> : null}
              {s.count} · {s.label}
            </li>
          ))}
        </ul>
      ) : null}

      {data && data.sowQueue.length > 0 ? <SowGroup items={data.sowQueue} /> : null}

      {data?.round.stores.map((store) => (
        <section key={store.storeId} aria-labelledby={`store-${store.storeId}`} className="space-y-3">
          <h2 id={`store-${store.storeId}`} className="flex items-baseline justify-between border-b-2 border-rime-200 pb-1 text-title font-bold text-glacier-800">
            <span>{store.storeName}</span>
            <span className="text-label font-semibold text-ink-soft">{data.storeDue.get(store.storeId) ?? 0} due</span>
          </h2>
          {store.boxes.map((box) => (
            <div key={box.box} className="space-y-2">
              <h3 className="flex items-baseline justify-between text-label font-semibold uppercase tracking-wide text-ink-soft">
                <span>{box.box}</span>
                <span>{box.items.length}</span>
              </h3>
              <ul className="space-y-2">
                {box.items.map((item) => (
                  <RoundRow key={item.bag.id} item={item} />
                ))}
              </ul>
            </div>
          ))}
        </section>
      ))}
    </div>
  );
}

// Routine work, a decision, work to do now, and trouble each look different (frame, mark and words), from the
// same rule that picks the check sheet's first step.
const cardLook: Record<SheetTone, { frame: string; mark: string; text: string }> = {
  routine: { frame: "border-rime-200", mark: "", text: "text-ink-soft" },
  decide: { frame: "border-glacier-600 border-l-8", mark: "◐ ", text: "text-glacier-800" },
  act: { frame: "border-wheat-600 border-l-8", mark: "▲ ", text: "text-wheat-700" },
  trouble: { frame: "border-ember-600 border-l-8", mark: "✕ ", text: "text-ember-700" },
  closed: { frame: "border-rime-200", mark: "", text: "text-ink-soft" },
};

// The summary chips in the same four tones as the cards, each with its mark so they read apart in greyscale.
const chipLook: Record<Exclude<SheetTone, "closed">, { frame: string; mark: string }> = {
  routine: { frame: "border-rime-300 bg-rime-100 text-glacier-800", mark: "" },
  decide: { frame: "border-glacier-600 bg-paper text-glacier-800", mark: "◐ " },
  act: { frame: "border-wheat-600 bg-wheat-100 text-wheat-700", mark: "▲ " },
  trouble: { frame: "border-ember-600 bg-ember-100 text-ember-700", mark: "✕ " },
};

function RoundRow({ item }: { item: RoundItem }) {
  const choice = chooseSheetSteps({ state: item.state, findings: allGoodFindings, entered: false, lastCheck: item.bag.lastCheck ?? null });
  const look = cardLook[choice.tone];
  return (
    <li>
      <Link
        href={`/check?bag=${encodeURIComponent(item.bag.id)}&from=today`}
        className={`block min-h-tap rounded-card border-2 bg-paper p-3 shadow-sm hover:bg-rime-50 ${look.frame}`}
        data-testid="round-bag"
        data-tone={choice.tone}
      >
        <span className="flex items-center justify-between gap-2">
          <span className="font-mono text-title font-bold tracking-wider text-ink">{formatBagCode(item.bag.code)}</span>
          <StateBadge state={item.state} sprouts={item.bag.lastCheck?.sprouts} />
        </span>
        <span className="mt-1 block text-body text-ink">{item.bag.species}</span>
        <span className={`mt-1 block text-label font-semibold ${look.text}`}>
          {look.mark ? <span aria-hidden="true">{look.mark}</span> : null}
          {item.next.note}
          {item.isLate ? ` (due since ${formatShortDay(item.next.on)})` : ""}
        </span>
        {choice.first.length ? (
          <span className="mt-1 block text-label text-ink-soft">First: {choice.first.map((s) => sheetStepLabels[s]).join(" or ")}</span>
        ) : null}
      </Link>
    </li>
  );
}

function SowGroup({ items }: { items: SowItem<PulledBagRow>[] }) {
  return (
    <section aria-labelledby="to-sow" className="space-y-3" data-testid="to-sow">
      <h2 id="to-sow" className="flex items-baseline justify-between border-b-2 border-moss-600 pb-1 text-title font-bold text-glacier-800">
        <span>To sow</span>
        <span className="text-label font-semibold text-ink-soft">{items.length} pulled</span>
      </h2>
      <ul className="space-y-2">
        {items.map((item) => {
          // Late is trouble (✕, ember); roots showing but not yet late is work to do now (▲, wheat).
          const look = item.isLate ? cardLook.trouble : item.sprouted ? cardLook.act : cardLook.routine;
          return (
            <li key={item.bag.id}>
              <Link
                href={`/sowing?bag=${encodeURIComponent(item.bag.id)}`}
                className={`block min-h-tap rounded-card border-2 bg-paper p-3 shadow-sm hover:bg-rime-50 ${look.frame}`}
                data-testid="sow-bag"
              >
                <span className="flex items-center justify-between gap-2">
                  <span className="font-mono text-title font-bold tracking-wider text-ink">{formatBagCode(item.bag.code)}</span>
                  <StateBadge state="pulled" />
                </span>
                <span className="mt-1 block text-body text-ink">{item.bag.species}</span>
                <span className={`mt-1 block text-label font-semibold ${look.text}`}>
                  {look.mark ? <span aria-hidden="true">{look.mark}</span> : null}
                  {item.note}
                </span>
              </Link>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
