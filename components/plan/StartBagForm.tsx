"use client";

import Link from "next/link";
import { useState } from "react";
import type { PlanItem } from "@/lib/schemas/plan";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";
import { media, vocabularyLabels, type Medium } from "@/lib/schemas/words";
import { serverStamped } from "@/lib/schemas/common";
import { createBag, savePlanItem } from "@/lib/client/repo";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { Button, buttonClass } from "@/components/ui/Button";
import { Field, Input, Select } from "@/components/ui/Field";
import { BagCautions } from "@/components/bags/BagCautions";
import { fillPullWindow, generateUniqueBagCode, pickDefaultStore } from "@/components/bags/new-bag-defaults";
import { describeSaveError } from "@/components/bags/save-error";
import { pickBagCautions } from "@/components/check/bag-cautions";
import { Notice } from "@/components/season/Notice";

/** The stored plan row as plan.upsert takes it (server-stamped columns dropped). */
export function toPlanInput(item: PlanItem) {
  const input: Record<string, unknown> = { ...item };
  for (const k of Object.keys(serverStamped)) delete input[k];
  return input as Omit<PlanItem, keyof typeof serverStamped>;
}

/** "Start this bag": a bag from the plan row, going in today, linked both ways. */
export function StartBagForm({
  item,
  lot,
  protocol,
  stores,
  codes,
  seedsNeeded,
  today,
  onDone,
}: {
  item: PlanItem;
  lot: Lot;
  protocol: ProtocolRow | null;
  stores: readonly Store[];
  codes: readonly string[];
  seedsNeeded: number | null;
  today: string;
  onDone: () => void;
}) {
  const [storeId, setStoreId] = useState(pickDefaultStore(stores)?.id ?? "");
  const store = stores.find((s) => s.id === storeId) ?? null;
  const [box, setBox] = useState(store?.boxes[0] ?? "");
  const [medium, setMedium] = useState<Medium>("paper_towel");
  const defaultSeeds = seedsNeeded === null ? (lot.quantity ?? "") : lot.quantity != null ? Math.min(seedsNeeded, lot.quantity) : seedsNeeded;
  const [seeds, setSeeds] = useState(String(defaultSeeds));
  const [error, setError] = useState<string | null>(null);
  const [started, setStarted] = useState<{ id: string; code: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function start() {
    setError(null);
    const seedCount = seeds.trim() === "" ? null : Number(seeds);
    if (seedCount !== null && (!Number.isInteger(seedCount) || seedCount < 1)) return setError("Seeds in the bag: a whole number of at least 1, or leave it empty.");
    setBusy(true);
    try {
      const code = generateUniqueBagCode(codes, () => crypto.getRandomValues(new Uint8Array(8)));
      const bag = await createBag({
        code,
        lot_id: lot.id,
        protocol_id: protocol?.id ?? null,
        store_id: store?.id ?? null,
        box: box || null,
        medium,
        seed_count: seedCount,
        start_date: today,
        planned_start_date: null,
        ...fillPullWindow(protocol, today),
        plan_item_id: item.id,
      });
      await savePlanItem({ ...toPlanInput(item), bag_id: bag.id });
      setStarted({ id: bag.id, code: bag.code });
    } catch (e) {
      setError(describeSaveError(e));
    } finally {
      setBusy(false);
    }
  }

  if (started) {
    return (
      <div role="status" className="space-y-3 rounded-xl bg-moss-100 p-3">
        <p className="text-body font-semibold text-moss-700">
          Bag <span className="font-mono tracking-wider">{formatBagCode(started.code)}</span> started today and linked to this plan row.
        </p>
        <div className="flex flex-wrap gap-2">
          <Link className={buttonClass("primary")} href={`/bags/view?id=${encodeURIComponent(started.id)}`}>
            Open the bag
          </Link>
          <Button tone="quiet" onClick={onDone}>
            Done
          </Button>
        </div>
      </div>
    );
  }
  const cautions = pickBagCautions({ species: lot.species, toxicSeed: protocol?.toxic_seed ?? null, medicinal: protocol?.medicinal ?? false, storeHoldsFood: store?.holds_food ?? false, treated: lot.treated });
  const fid = `start-${item.id}`;
  return (
    <div className="space-y-3 rounded-xl bg-rime-50 p-3">
      <p className="text-label text-ink">
        A new bag of <strong>{lot.species}</strong> from this lot, starting today{protocol ? ` with ${protocol.species}'s protocol` : " (no protocol: no pull window yet)"}.
      </p>
      <div className="grid grid-cols-2 gap-3">
        <Field label="Cold store" htmlFor={`${fid}-store`}>
          <Select
            id={`${fid}-store`}
            value={storeId}
            onChange={(e) => {
              setStoreId(e.target.value);
              setBox(stores.find((s) => s.id === e.target.value)?.boxes[0] ?? "");
            }}
          >
            <option value="">Not in a store yet</option>
            {stores.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Box or shelf" htmlFor={`${fid}-box`}>
          <Select id={`${fid}-box`} value={box} onChange={(e) => setBox(e.target.value)} disabled={!store?.boxes.length}>
            <option value="">—</option>
            {store?.boxes.map((b) => (
              <option key={b} value={b}>
                {b}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Medium" htmlFor={`${fid}-medium`}>
          <Select id={`${fid}-medium`} value={medium} onChange={(e) => setMedium(e.target.value as Medium)}>
            {media.map((m) => (
              <option key={m} value={m}>
                {vocabularyLabels.medium[m]}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Seeds in the bag" htmlFor={`${fid}-seeds`}>
          <Input id={`${fid}-seeds`} inputMode="numeric" value={seeds} onChange={(e) => setSeeds(e.target.value)} />
        </Field>
      </div>
      <BagCautions cautions={cautions} />
      <Notice>{error}</Notice>
      <div className="flex gap-2">
        <Button className="flex-1" disabled={busy} onClick={() => void start()}>
          Start bag today
        </Button>
        <Button tone="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </div>
  );
}
