"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { buttonClass } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Input } from "@/components/ui/Field";
import { useMember } from "@/components/season/use-member";
import { useBagSources } from "@/components/bags/use-farm-rows";
import { describeLotUse, sortLots, summarizeLotUse } from "./lot-use";

export function LotsList() {
  const sources = useBagSources();
  const { can } = useMember();
  const [text, setText] = useState("");
  const lots = useMemo(() => {
    if (!sources) return [];
    const q = text.trim().toLowerCase();
    return sortLots(sources.lots).filter((l) => !q || [l.species, l.common_name, l.source, l.year].join(" ").toLowerCase().includes(q));
  }, [sources, text]);
  if (!sources) return <p className="p-4 text-body text-ink-soft">Opening the seed lots on this phone…</p>;
  const protocolName = new Map(sources.protocols.map((p) => [p.id, p.is_farm_own ? "farm's own" : "published source"]));

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 pb-28 pt-4">
      <PageHeader
        title="Seed lots"
        subtitle={`${sources.lots.length} lot${sources.lots.length === 1 ? "" : "s"}`}
        action={
          can("lot.create") ? (
            <Link href="/lots/edit" className={buttonClass("primary", "md")}>
              <span aria-hidden="true">+</span> New lot
            </Link>
          ) : null
        }
      />
      <label className="mb-3 block">
        <span className="sr-only">Search lots</span>
        <Input type="search" placeholder="Search species, source or year" value={text} onChange={(e) => setText(e.target.value)} />
      </label>
      {lots.length === 0 ? (
        <Card>
          <p className="text-body">{sources.lots.length ? "No lot matches." : "No seed lots yet. Add the first one: species, where it came from, the year and how many seeds."}</p>
        </Card>
      ) : null}
      <ul className="space-y-2">
        {lots.map((lot) => {
          const use = summarizeLotUse(lot, sources.bags);
          const pct = lot.quantity ? Math.min(100, (use.seedsInBags / lot.quantity) * 100) : 0;
          return (
            <li key={lot.id}>
              <Card className="space-y-2 p-3">
                <div className="flex items-start justify-between gap-2">
                  <div>
                    <p className="text-body font-semibold">
                      <i>{lot.species}</i>
                    </p>
                    {lot.common_name ? <p className="text-label text-ink-soft">{lot.common_name}</p> : null}
                  </div>
                  {lot.treated ? (
                    <span className="rounded-full bg-ember-100 px-2.5 py-0.5 text-label font-semibold text-ember-700">
                      <span aria-hidden="true">⚠ </span>Treated
                    </span>
                  ) : null}
                </div>
                <p className="text-label text-ink-soft">
                  {[lot.source, lot.year].filter(Boolean).join(" · ") || "Source not recorded"}
                  {lot.protocol_id ? ` · protocol: ${protocolName.get(lot.protocol_id) ?? "not on this phone"}` : ""}
                </p>
                <div>
                  <p className={`text-label ${use.overCommitted ? "font-semibold text-ember-700" : ""}`}>
                    {describeLotUse(lot, use)}
                    {use.overCommitted ? " — more than the lot holds; check the quantity." : use.left !== null && use.bags ? ` · ${use.left} left` : ""}
                  </p>
                  {lot.quantity ? (
                    <div className="mt-1 h-2 overflow-hidden rounded-full bg-rime-200" aria-hidden="true">
                      <div className={`h-full ${use.overCommitted ? "bg-ember-600" : "bg-glacier-600"}`} style={{ width: `${pct}%` }} />
                    </div>
                  ) : null}
                </div>
                <div className="flex flex-wrap gap-2">
                  {can("bag.create") ? (
                    <Link href={`/bags/new?lot=${encodeURIComponent(lot.id)}`} className={buttonClass("secondary", "md")}>
                      New bag from this lot
                    </Link>
                  ) : null}
                  {can("lot.update") ? (
                    <Link href={`/lots/edit?id=${encodeURIComponent(lot.id)}`} className={buttonClass("quiet", "md")}>
                      Edit
                    </Link>
                  ) : null}
                </div>
              </Card>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
