"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { describeReconciledPhase, reconcileProtocol } from "@/lib/domain/protocols";
import { vocabularyLabels } from "@/lib/schemas/words";
import { buttonClass } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Chip } from "@/components/ui/Chip";
import { Input } from "@/components/ui/Field";
import { useMember } from "@/components/season/use-member";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { listProtocolCitations } from "@/lib/domain/rows/starter-row";
import { OriginBadge } from "./OriginBadge";

type Show = "all" | "farm" | "published";

export function ProtocolLibrary() {
  const rows = useLiveQuery(async () => (await getLocalDb().protocols.toArray()).filter((p) => !p.deleted_at), []);
  const { can } = useMember();
  const [text, setText] = useState("");
  const [show, setShow] = useState<Show>("all");
  const list = useMemo(() => {
    const q = text.trim().toLowerCase();
    return (rows ?? [])
      .filter((r) => show === "all" || (show === "farm") === Boolean(r.is_farm_own))
      .filter((r) => !q || `${r.species} ${r.common_name ?? ""}`.toLowerCase().includes(q))
      .sort((a, b) => a.species.localeCompare(b.species) || Number(b.is_farm_own) - Number(a.is_farm_own));
  }, [rows, text, show]);
  if (!rows) return <p className="p-4 text-body text-ink-soft">Opening the protocol library on this phone…</p>;

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 pb-28 pt-4">
      <PageHeader
        title="Protocols"
        subtitle="Each species' pretreatment, with its sources"
        action={
          can("protocol.upsert") ? (
            <Link href="/protocols/edit" className={buttonClass("primary", "md")}>
              <span aria-hidden="true">+</span> New
            </Link>
          ) : null
        }
      />
      <label className="mb-2 block">
        <span className="sr-only">Search protocols</span>
        <Input type="search" placeholder="Search species" value={text} onChange={(e) => setText(e.target.value)} />
      </label>
      <div role="group" aria-label="Show" className="mb-3 flex flex-wrap gap-2">
        {(
          [
            ["all", "All"],
            ["farm", "Farm's own"],
            ["published", "Published sources"],
          ] as const
        ).map(([k, label]) => (
          <Chip key={k} pressed={show === k} onClick={() => setShow(k)}>
            {label}
          </Chip>
        ))}
      </div>
      {list.length === 0 ? (
        <Card>
          <p className="text-body">{rows.length ? "No protocol matches." : "No protocols on this phone yet."}</p>
        </Card>
      ) : null}
      <ul className="space-y-2">
        {list.map((row) => {
          const p = readProtocolRow(row);
          const r = reconcileProtocol(p);
          const citations = listProtocolCitations(row);
          return (
            <li key={row.id}>
              <Link href={`/protocols/view?id=${encodeURIComponent(row.id)}`} className="block rounded-card border border-rime-200 bg-paper p-3 shadow-sm active:bg-rime-100">
                <div className="flex items-start justify-between gap-2">
                  <p className="text-body font-semibold">
                    <i>{p.species}</i>
                    {p.commonName ? <span className="block text-label font-normal text-ink-soft">{p.commonName}</span> : null}
                  </p>
                  <OriginBadge farmOwn={p.isFarmOwn} />
                </div>
                <ul className="mt-1 text-label">
                  {r.phases.length === 0 ? <li>{p.noColdReason || "No phases recorded."}</li> : null}
                  {r.phases.map((ph, i) => (
                    <li key={i}>{describeReconciledPhase(ph, vocabularyLabels.phaseKind[ph.kind])}</li>
                  ))}
                </ul>
                <p className="mt-1 flex flex-wrap gap-x-3 text-label text-ink-soft">
                  <span>
                    {citations.length} source{citations.length === 1 ? "" : "s"}
                  </span>
                  {r.sourcesDisagree ? <span className="font-semibold text-wheat-700">◆ Sources disagree</span> : null}
                  {p.toxicSeed ? <span className="font-semibold text-ember-700">⚠ Toxic seed</span> : null}
                  {p.medicinal ? <span>✚ Medicinal</span> : null}
                </p>
              </Link>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
