"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { Button } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { useMember } from "@/components/season/use-member";
import { assembleTrialTable } from "./trial-table";
import { NewTrialForm } from "./TrialForm";


export function TrialsScreen() {
  const { can } = useMember();
  const router = useRouter();
  const [adding, setAdding] = useState(false);
  const data = useLiveQuery(async () => {
    const db = getLocalDb();
    const live = <T extends { deleted_at: string | null }>(r: T[]) => r.filter((x) => !x.deleted_at);
    const [trials, arms, lots, bags, sowings, counts] = await Promise.all([
      db.trials.toArray(), db.trial_arms.toArray(), db.lots.toArray(), db.bags.toArray(), db.sowings.toArray(), db.counts.toArray(),
    ]);
    return { trials: live(trials).sort((a, b) => b.created_at.localeCompare(a.created_at)), arms: live(arms), lots: live(lots), bags: live(bags), sowings: live(sowings), counts: live(counts) };
  }, []);

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <PageHeader
        title="Trials"
        subtitle="The same lot, treated differently: which did better?"
        action={can("trial.create") && !adding ? <Button onClick={() => setAdding(true)}>New</Button> : null}
      />
      {adding && data ? (
        <Card>
          <NewTrialForm
            lots={data.lots}
            onDone={(id) => {
              setAdding(false);
              if (id) router.push(`/trials/view?id=${id}`);
            }}
          />
        </Card>
      ) : null}
      {data === undefined ? <p className="text-ink-soft">Opening…</p> : null}
      {data && data.trials.length === 0 ? (
        <Card>
          <p>No trials yet. Put bags of one lot through two treatments (fridge and freezer, 30 and 60 days, towel and sand), count what comes up, and Rimebook says whether the difference is real.</p>
        </Card>
      ) : null}
      <ul className="space-y-3">
        {data?.trials.map((t) => {
          const arms = data.arms.filter((a) => a.trial_id === t.id);
          const table = assembleTrialTable({ arms, bags: data.bags, sowings: data.sowings, counts: data.counts });
          const lot = data.lots.find((l) => l.id === t.lot_id);
          const first = table.comparisons[0]?.verdict;
          return (
            <li key={t.id}>
              <Link href={`/trials/view?id=${t.id}`} className="block rounded-card border border-rime-200 bg-paper p-4 shadow-sm hover:border-glacier-500">
                <p className="text-body font-bold text-ink">{t.name}</p>
                <p className="text-label text-ink-soft">
                  {lot?.species ?? "No lot"} · {arms.length} arms: {arms.map((a) => a.label).join(" · ")}
                </p>
                <p className={`mt-2 border-l-4 pl-2 text-label font-semibold ${first?.kind === "clear_difference" ? "border-moss-600 text-moss-700" : "border-rime-300 text-ink"}`}>
                  {first ? first.headline : "Waiting for counts"}
                </p>
              </Link>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
