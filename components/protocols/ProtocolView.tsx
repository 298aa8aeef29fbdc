"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb, type ProtocolRow } from "@/lib/client/db";
import { reconcileProtocol, type ReconciledPhase } from "@/lib/domain/protocols";
import { formatTemperature } from "@/lib/domain/units";
import { vocabularyLabels } from "@/lib/schemas/words";
import type { ProtocolSource, TemperatureBand } from "@/lib/schemas/protocol";
import { saveProtocol } from "@/lib/client/repo";
import { Button, buttonClass } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { useMember } from "@/components/season/use-member";
import { describeSaveError } from "@/components/bags/save-error";
import { copyToFarmOwn } from "./protocol-form-values";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { findStarterFor } from "@/lib/domain/rows/starter-row";
import { OriginBadge } from "./OriginBadge";
import { SaveError } from "@/components/bags/FormBits";
import { FarmHistoryPanel } from "@/components/learn/FarmHistoryPanel";

export function describeDays(min: number, max: number | null): string {
  if (max === null) return `${min} days or more`;
  return min === max ? `${min} days` : `${min}–${max} days`;
}

export function describeBand(b: TemperatureBand | null): string {
  if (!b) return "";
  return b.minC === b.maxC ? `at ${formatTemperature(b.minC, "C", 0)}` : `${formatTemperature(b.minC, "C", 0)} to ${formatTemperature(b.maxC, "C", 0)}`;
}

export function ProtocolView() {
  const id = useSearchParams().get("id");
  const row = useLiveQuery(async () => (id ? ((await getLocalDb().protocols.get(id)) ?? null) : null), [id]);
  if (!id || row === null || row?.deleted_at) {
    return (
      <div className="mx-auto max-w-xl lg:max-w-4xl space-y-3 px-4 pt-6">
        <p className="text-body">{id ? "This protocol is not on this phone. It may have been removed, or the phone has not synced it yet." : "No protocol was chosen."}</p>
        <Link href="/protocols" className={buttonClass("secondary", "md")}>
          All protocols
        </Link>
      </div>
    );
  }
  if (row === undefined) return <p className="p-4 text-body text-ink-soft">Opening the protocol on this phone…</p>;
  return <ProtocolDetail row={row} />;
}

function ProtocolDetail({ row }: { row: ProtocolRow }) {
  const router = useRouter();
  const { can } = useMember();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const p = readProtocolRow(row);
  const r = reconcileProtocol(p);
  const starter = findStarterFor(row);
  const mayEdit = can("protocol.upsert");

  const copy = async () => {
    setBusy(true);
    setError(null);
    try {
      const saved = await saveProtocol(copyToFarmOwn(row, crypto.randomUUID()));
      router.push(`/protocols/edit?id=${encodeURIComponent(saved.id)}`);
    } catch (e) {
      setError(describeSaveError(e));
      setBusy(false);
    }
  };

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl space-y-4 px-4 pb-28 pt-4">
      <Link href="/protocols" className="inline-flex min-h-tap items-center text-label font-semibold text-glacier-700">
        ← All protocols
      </Link>
      <header className="space-y-1">
        <div className="flex items-start justify-between gap-2">
          <h1 className="text-title font-bold text-glacier-800">
            <i>{p.species}</i>
          </h1>
          <OriginBadge farmOwn={p.isFarmOwn} />
        </div>
        {p.commonName ? <p className="text-body text-ink-soft">{p.commonName}</p> : null}
        <p className="text-label text-ink-soft">
          {p.isFarmOwn
            ? "The farm's own numbers: edit them as the farm learns."
            : "From a published source, shown as printed. Copy it to the farm's own to change the numbers."}
        </p>
      </header>

      {r.phases.length === 0 ? (
        <Card className="space-y-1">
          <h2 className="text-body font-bold text-glacier-800">No cold needed</h2>
          <p className="text-body">{p.noColdReason || "This protocol has no phases."}</p>
          {starter?.citations.length ? <p className="text-label text-ink-soft">Source: {starter.citations.join("; ")}</p> : null}
        </Card>
      ) : null}

      {r.phases.map((ph, i) => (
        <PhaseCard key={i} index={i} phase={ph} sources={p.phases[i]?.sources ?? []} />
      ))}

      {r.timedPhases.length ? (
        <Card className="space-y-1">
          <h2 className="text-body font-bold text-glacier-800">Counts as cold</h2>
          <p className="text-body">
            {formatTemperature(r.effectiveBand.minC, "C", 0)} to {formatTemperature(r.effectiveBand.maxC, "C", 0)}, best {formatTemperature(r.optimumBand.minC, "C", 0)} to{" "}
            {formatTemperature(r.optimumBand.maxC, "C", 0)}
            {p.effectiveBand ? " (this protocol's own band)" : " (Rimebook's default band)"}.
          </p>
          <p className="text-label text-ink-soft">
            Cold-stratification tables often give 1–5 °C (Chong et al., Handbook of Plant and Crop Physiology); some species do best nearer 10 °C. A freezer is a
            different treatment, not more cold.
          </p>
        </Card>
      ) : null}

      {p.note ? <p className="whitespace-pre-line rounded-card bg-rime-100 p-3 text-body">{p.note}</p> : null}

      {r.timedPhases.length ? <FarmHistoryPanel key={row.id} species={p.species} protocol={row} /> : null}

      <div className="space-y-2">
        {p.toxicSeed ? (
          <Caution title="Toxic seed">
            <p>{cautionTexts.toxic}</p>
            <p className="mt-1 text-ink-soft">
              {p.toxicSeed.verified && p.toxicSeed.citation ? `Source: ${p.toxicSeed.citation}.` : "Flag from memory, not yet verified against a source."}
              {p.toxicSeed.note ? ` ${p.toxicSeed.note}` : ""}
            </p>
          </Caution>
        ) : null}
        {p.medicinal ? (
          <Caution title="Medicinal plant">
            <p>{cautionTexts.medicinal}</p>
          </Caution>
        ) : null}
      </div>

      {mayEdit ? (
        <div className="space-y-2">
          {p.isFarmOwn ? (
            <Link href={`/protocols/edit?id=${encodeURIComponent(row.id)}`} className={`${buttonClass("primary", "lg")} w-full`}>
              Edit the farm&apos;s protocol
            </Link>
          ) : null}
          <Button tone={p.isFarmOwn ? "quiet" : "primary"} size={p.isFarmOwn ? "md" : "lg"} className="w-full" disabled={busy} onClick={copy}>
            {p.isFarmOwn ? "Make a copy" : "Copy to the farm's own"}
          </Button>
          <SaveError message={error} />
        </div>
      ) : null}
    </div>
  );
}

function PhaseCard({ index, phase, sources }: { index: number; phase: ReconciledPhase; sources: readonly ProtocolSource[] }) {
  const label = vocabularyLabels.phaseKind[phase.kind];
  return (
    <Card className="space-y-2">
      <h2 className="text-body font-bold text-glacier-800">
        <span className="text-ink-soft">{index + 1}. </span>
        {label}
        {phase.timed ? <span className="font-normal"> · {describeDays(phase.minDays, phase.maxDays)}</span> : null}
      </h2>
      {phase.note ? <p className="text-body">{phase.note}</p> : null}
      {phase.timed ? (
        <div className="rounded-xl bg-rime-100 p-2 text-label">
          <p>
            <span className="font-semibold">Plan for day {phase.plannedDays}</span>
            {phase.agreedRange ? `; every source accepts ${describeDays(phase.agreedRange.minDays, phase.agreedRange.maxDays)}.` : "."}
          </p>
          {phase.sourcesDisagree ? (
            <p className="mt-1 font-semibold text-wheat-700">
              <span aria-hidden="true">◆ </span>Sources disagree. Plan for the earliest date and check daily from then, pulling as soon as the first roots show (common
              practice, no published source).
            </p>
          ) : null}
        </div>
      ) : null}
      <ul className="space-y-2">
        {sources.map((s, i) => (
          <li key={i} className="border-l-4 border-glacier-400 pl-3">
            {phase.timed ? (
              <p className="text-body font-semibold">
                {describeDays(s.minDays, s.maxDays)} {describeBand(s.band)}
              </p>
            ) : null}
            {s.note ? <p className="text-label">{s.note}</p> : null}
            <p className="text-label text-ink-soft">
              <span aria-hidden="true">❝ </span>
              <cite className="not-italic">{s.citation}</cite>
            </p>
          </li>
        ))}
      </ul>
    </Card>
  );
}
