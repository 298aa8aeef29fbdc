"use client";

import dynamic from "next/dynamic";
import Link from "next/link";
import { useMemo, useState } from "react";
import { useSearchParams } from "next/navigation";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { loadReadingsOfBagStores } from "@/lib/client/fridge-reads";
import { saveProtocol, updateBag } from "@/lib/client/repo";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { describeReconciledPhase, reconcileProtocol } from "@/lib/domain/protocols";
import { determineBagState } from "@/lib/domain/schedule";
import { vocabularyLabels, type StoreKind } from "@/lib/schemas/words";
import type { MutationArgs } from "@/lib/schemas/mutations";
import { Button } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { StateBadge } from "@/components/ui/StateBadge";
import { describeSaveError } from "@/components/bags/save-error";
import { pickProtocolForLot } from "@/components/bags/new-bag-defaults";
import { findEffectiveBagWindow, prepareReadingsByStore } from "@/lib/domain/rows/bag-rows";
import { useToday } from "@/components/bags/use-farm-rows";
import { useMember } from "@/components/season/use-member";
import { assembleTrialTable, buildTrialProtocol } from "./trial-table";
import { ComparisonTable } from "./ComparisonTable";
import { Notice } from "@/components/season/Notice";
import { TrialDelete } from "./TrialDelete";

// Opened by a tap, so loaded then (react-hook-form and zod stay out of the first load; precached for offline).
const EditTrialForm = dynamic(() => import("./TrialForm").then((m) => m.EditTrialForm), { ssr: false });

const verdictLook = {
  clear_difference: "border-moss-600 bg-moss-100",
  hint: "border-wheat-600 bg-wheat-100",
  no_clear_difference: "border-rime-300 bg-rime-50",
} as const;

export function TrialView() {
  const id = useSearchParams().get("id") ?? "";
  const today = useToday();
  const { can } = useMember();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [preview, setPreview] = useState<MutationArgs<"protocol.upsert"> | null>(null);
  const [editing, setEditing] = useState(false);
  const [edited, setEdited] = useState(false);

  const data = useLiveQuery(async () => {
    const db = getLocalDb();
    const trial = await db.trials.get(id);
    if (!trial || trial.deleted_at) return { trial: null } as const;
    const arms = (await db.trial_arms.where("trial_id").equals(id).toArray()).filter((a) => !a.deleted_at);
    const lot = trial.lot_id ? ((await db.lots.get(trial.lot_id)) ?? null) : null;
    const allBags = (await db.bags.toArray()).filter((b) => !b.deleted_at);
    const armIds = new Set(arms.map((a) => a.id));
    const bags = allBags.filter((b) => (b.trial_arm_id && armIds.has(b.trial_arm_id)) || (lot ? b.lot_id === lot.id : false));
    const sowings = await db.sowings.where("bag_id").anyOf(bags.map((b) => b.id)).toArray();
    const counts = await db.counts.where("sowing_id").anyOf(sowings.map((s) => s.id)).toArray();
    const [protocols, stores, lots] = await Promise.all([db.protocols.toArray(), db.stores.toArray(), db.lots.toArray()]);
    // The fridges' readings since the earliest of these bags went in: they move windows, as on every other screen.
    const readings = await loadReadingsOfBagStores(db, bags, stores, "in_cold");
    return { trial, arms, lot, bags, sowings, counts, protocols: protocols.filter((p) => !p.deleted_at), stores, lots: lots.filter((l) => !l.deleted_at), readingsByStore: prepareReadingsByStore(readings) } as const;
  }, [id]);

  const table = useMemo(() => (data?.trial ? assembleTrialTable({ arms: data.arms, bags: data.bags, sowings: data.sowings, counts: data.counts }) : null), [data]);

  if (!id) return <Missing text="No trial was chosen." />;
  if (data === undefined) return <p className="p-4 text-ink-soft">Opening the trial on this phone…</p>;
  if (!data.trial || !table) return <Missing text="This trial is not on this phone. It may not have synced yet." />;
  const { trial, arms, lot, bags, protocols, stores, lots, readingsByStore } = data;
  const ownProtocol = protocols.find((p) => p.source_trial_id === trial.id) ?? null;
  const winner = table.winner;
  const canAssign = can("bag.update");
  const canAdopt = can("protocol.upsert");

  function prepareProtocol() {
    if (!winner || !table) return;
    setMessage(null);
    const winnerBags = bags.filter((b) => b.trial_arm_id === winner.arm.id);
    const counted = new Map<string, number>();
    for (const b of winnerBags) if (b.protocol_id) counted.set(b.protocol_id, (counted.get(b.protocol_id) ?? 0) + 1);
    const commonId = [...counted.entries()].sort((a, b) => b[1] - a[1])[0]?.[0];
    const base = protocols.find((p) => p.id === commonId) ?? (lot ? pickProtocolForLot(lot, protocols) : null);
    try {
      setPreview(
        buildTrialProtocol({
          id: ownProtocol?.id ?? crypto.randomUUID(),
          trial,
          table,
          base,
          species: lot?.species ?? base?.species ?? trial.name,
          winnerBags: winnerBags.map((b) => ({ ...b, storeKind: (stores.find((s) => s.id === b.store_id)?.kind ?? null) as StoreKind | null })),
          today,
        }),
      );
    } catch (e) {
      setMessage({ ok: false, text: describeSaveError(e) });
    }
  }

  async function adopt() {
    if (!preview) return;
    try {
      await saveProtocol(preview);
      setPreview(null);
      setMessage({ ok: true, text: `Saved as the farm's own protocol for ${preview.species}, with this trial as its source.` });
    } catch (e) {
      setMessage({ ok: false, text: describeSaveError(e) });
    }
  }

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <Link href="/trials" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← All trials
      </Link>
      <PageHeader title={trial.name} subtitle={lot ? `${lot.species}${lot.source ? ` · ${lot.source}` : ""}${lot.year ? ` ${lot.year}` : ""}` : "No lot chosen"} />
      {trial.question ? <p className="text-body text-ink">{trial.question}</p> : null}
      {trial.notes ? <p className="whitespace-pre-line text-label text-ink-soft">{trial.notes}</p> : null}
      {can("trial.update") ? (
        editing ? (
          <Card>
            <EditTrialForm
              trial={trial}
              lots={lots}
              onDone={(saved) => {
                setEditing(false);
                setEdited(saved);
              }}
            />
          </Card>
        ) : (
          <div className="space-y-2">
            <Button
              tone="quiet"
              className="w-full"
              onClick={() => {
                setEdited(false);
                setEditing(true);
              }}
            >
              Edit trial
            </Button>
            {edited ? <Notice ok>Trial saved on this phone; it goes to the farm when there is signal.</Notice> : null}
          </div>
        )
      ) : null}

      <Card className="space-y-3">
        <h2 className="text-body font-bold text-glacier-800">Verdict</h2>
        {table.comparisons.length === 0 ? (
          <p className="text-label text-ink-soft">A verdict needs at least two arms with counted sowings.</p>
        ) : (
          table.comparisons.map((c) => (
            <div key={c.armId} className={`rounded-xl border-l-4 p-3 ${verdictLook[c.verdict.kind]}`}>
              <p className="text-body font-semibold text-ink">{c.verdict.headline}</p>
              <p className="mt-1 text-label text-ink-soft">{c.verdict.numbers}</p>
              <ul className="mt-1 list-disc pl-5 text-label text-ink-soft">
                {c.verdict.cautions.map((x) => (
                  <li key={x}>{x}</li>
                ))}
              </ul>
            </div>
          ))
        )}
        {table.notes.length ? (
          <ul className="list-disc pl-5 text-label text-ink-soft">
            {table.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
        ) : null}
        <ComparisonTable table={table} />
        <p className="text-label text-ink-soft">
          Intervals: Wilson score (Wilson 1927) for each arm; Newcombe’s hybrid score method for the difference (Newcombe 1998, Stat. Med. 17:873–890); Fisher’s exact test for chance.
        </p>
      </Card>

      {canAdopt ? (
        <Card className="space-y-3">
          <h2 className="text-body font-bold text-glacier-800">Make this our protocol</h2>
          {ownProtocol ? <p className="text-label text-moss-700">The farm already has a protocol from this trial ({ownProtocol.species}); saving again updates it.</p> : null}
          {winner ? (
            <>
              <p className="text-label text-ink">
                {winner.arm.label} clearly did best. Copy its treatment into the farm&apos;s own protocol for {lot?.species ?? "this species"}, citing this trial.
              </p>
              {!preview ? (
                <Button onClick={prepareProtocol}>Prepare the protocol</Button>
              ) : (
                <div className="space-y-3 rounded-xl bg-rime-50 p-3">
                  <p className="font-semibold">{preview.species} (farm&apos;s own)</p>
                  <ul className="list-disc pl-5 text-label">
                    {reconcileProtocol(preview).phases.map((p, i) => (
                      <li key={i}>{describeReconciledPhase(p, vocabularyLabels.phaseKind[p.kind])}</li>
                    ))}
                  </ul>
                  <p className="text-label text-ink-soft">Source: {preview.phases.flatMap((p) => p.sources).find((s) => s.citation.startsWith("Farm trial"))?.citation}</p>
                  <div className="flex gap-2">
                    <Button tone="good" className="flex-1" onClick={() => void adopt()}>
                      Save as our protocol
                    </Button>
                    <Button tone="quiet" onClick={() => setPreview(null)}>
                      Cancel
                    </Button>
                  </div>
                </div>
              )}
            </>
          ) : (
            <p className="text-label text-ink-soft">No arm has clearly won yet, so there is nothing to copy. One trial is a hint; repeat it with more seed before changing the protocol.</p>
          )}
          {message ? <Notice ok={message.ok}>{message.text}</Notice> : null}
        </Card>
      ) : null}

      <Card className="space-y-3">
        <h2 className="text-body font-bold text-glacier-800">Bags in the trial</h2>
        <p className="text-label text-ink-soft">{lot ? `Bags of this lot; put each in the arm it is treated by.` : "Choose a lot for the trial to list its bags."}</p>
        <ul className="divide-y divide-rime-100">
          {bags.map((b) => {
            const storeKind = stores.find((st) => st.id === b.store_id)?.kind ?? null;
            const { window } = findEffectiveBagWindow(b, protocols.find((p) => p.id === b.protocol_id) ?? null, b.store_id ? readingsByStore.get(b.store_id) : null, today, { storeKind });
            const state = determineBagState({ startedOn: b.start_date, pulledOn: b.pulled_on, sownOn: b.sown_on, discardedOn: b.discarded_on }, window, today);
            return (
              <li key={b.id} className="flex items-center gap-3 py-2">
                <div className="min-w-0 flex-1">
                  <p className="font-mono font-bold tracking-wider">{formatBagCode(b.code)}</p>
                  <StateBadge state={state} />
                </div>
                <label className="sr-only" htmlFor={`arm-of-${b.id}`}>
                  Arm for bag {formatBagCode(b.code)}
                </label>
                <select
                  id={`arm-of-${b.id}`}
                  value={b.trial_arm_id && arms.some((a) => a.id === b.trial_arm_id) ? b.trial_arm_id : ""}
                  disabled={!canAssign}
                  onChange={(e) =>
                    void updateBag(b.id, { trial_arm_id: e.target.value || null }).catch((err) => setMessage({ ok: false, text: describeSaveError(err) }))
                  }
                  className="min-h-tap max-w-[55%] rounded-xl border-2 border-rime-300 bg-paper px-2 text-label"
                >
                  <option value="">Not in this trial</option>
                  {[...arms].sort((a, c) => a.position - c.position).map((a) => (
                    <option key={a.id} value={a.id}>
                      {a.label}
                    </option>
                  ))}
                </select>
              </li>
            );
          })}
        </ul>
        {arms.map((a) => (a.treatment ? <p key={a.id} className="text-label text-ink-soft"><strong>{a.label}:</strong> {a.treatment}</p> : null))}
      </Card>

      {can("trial.delete") ? (
        <Card>
          <TrialDelete
            trial={trial}
            armLabels={[...arms].sort((a, c) => a.position - c.position).map((a) => a.label)}
            bagsInArms={bags.filter((b) => arms.some((a) => a.id === b.trial_arm_id)).length}
            hasOwnProtocol={!!ownProtocol}
          />
        </Card>
      ) : null}
    </div>
  );
}

function Missing({ text }: { text: string }) {
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 pt-4">
      <Card>
        <p>{text}</p>
        <Link href="/trials" className="mt-3 inline-flex min-h-tap items-center font-semibold text-glacier-700">
          ← All trials
        </Link>
      </Card>
    </div>
  );
}
