"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb, type ProtocolRow } from "@/lib/client/db";
import { loadSpeciesHistory } from "@/lib/client/history-reads";
import { saveProtocol } from "@/lib/client/repo";
import { formatIsoDay } from "@/lib/domain/dates";
import { describeSeasons, farmWindowMinFinishedBags } from "@/lib/domain/farm-history";
import { reconcileProtocol } from "@/lib/domain/protocols";
import { buildRootsHistory } from "@/lib/domain/rows/farm-history-rows";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Field, Select } from "@/components/ui/Field";
import { useMember } from "@/components/season/use-member";
import { describeSaveError } from "@/components/bags/save-error";
import { SaveError } from "@/components/bags/FormBits";
import { buildFarmRecordProtocol, findFarmRecordProtocol } from "./farm-protocol";
import { RootsCurveChart } from "./RootsCurveChart";

// "On this farm": when this species' bags showed roots here, beside the protocol's published window. Read from the
// phone store, so it works with no signal. The chart's drawing (recharts) loads only when this panel shows it.

export function FarmHistoryPanel({ species, protocol, lotId = null }: { species: string; protocol: ProtocolRow | null; lotId?: string | null }) {
  const { can } = useMember();
  const data = useLiveQuery(async () => {
    const db = getLocalDb();
    const [rows, protocols] = await Promise.all([loadSpeciesHistory(db, species), db.protocols.toArray()]);
    return { ...rows, protocols };
  }, [species]);
  const [storeId, setStoreId] = useState("");
  const [pickedLot, setPickedLot] = useState("");
  const [onlyProtocol, setOnlyProtocol] = useState(false);
  const [saved, setSaved] = useState<{ id: string; species: string } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const today = formatIsoDay(new Date());
  const lot = lotId ?? (pickedLot || null);

  const history = useMemo(() => {
    if (!data) return null;
    const reconciled = protocol && !protocol.deleted_at ? reconcileProtocol(readProtocolRow(protocol)) : null;
    const protocolId = onlyProtocol && protocol ? protocol.id : null;
    return buildRootsHistory(data, data.checksByBag, { species, lotId: lot, storeId: storeId || null, protocolId }, reconciled, today);
  }, [data, protocol, species, lot, storeId, onlyProtocol, today]);

  if (!data || !history) return <p className="text-label text-ink-soft">Reading the farm&apos;s own bags…</p>;
  const { window, seasons } = history;
  const usedStores = data.stores.filter((s) => data.bags.some((b) => b.store_id === s.id && b.start_date));
  const existing = findFarmRecordProtocol(species, data.protocols);
  const mayAccept = can("protocol.upsert") && window.suggestsEarlier && !lot && !storeId && !onlyProtocol;

  async function accept() {
    setBusy(true);
    setError(null);
    try {
      // The whole species' record, whatever the filters show.
      const args = buildFarmRecordProtocol({ id: existing?.id ?? crypto.randomUUID(), species, base: protocol, history: history! });
      const row = await saveProtocol(args);
      setSaved({ id: row.id, species: args.species });
    } catch (e) {
      setError(describeSaveError(e));
    } finally {
      setBusy(false);
    }
  }

  return (
    <Card className="space-y-3" data-testid="farm-history">
      <h2 className="text-title font-bold text-glacier-800">On this farm</h2>
      {(!lotId && data.lots.length > 1) || usedStores.length > 1 ? (
        <div className="grid grid-cols-2 gap-2">
          {!lotId && data.lots.length > 1 ? (
            <Field label="Seed lot" htmlFor="history-lot">
              <Select id="history-lot" value={pickedLot} onChange={(e) => setPickedLot(e.target.value)}>
                <option value="">All lots</option>
                {data.lots.map((l) => (
                  <option key={l.id} value={l.id}>
                    {[l.source, l.year].filter(Boolean).join(" ") || "Unnamed lot"}
                  </option>
                ))}
              </Select>
            </Field>
          ) : null}
          {usedStores.length > 1 ? (
            <Field label="Cold store" htmlFor="history-store">
              <Select id="history-store" value={storeId} onChange={(e) => setStoreId(e.target.value)}>
                <option value="">All stores</option>
                {usedStores.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </Select>
            </Field>
          ) : null}
        </div>
      ) : null}

      {protocol && !lotId ? (
        <label className="flex min-h-tap items-center gap-3 text-label">
          <input type="checkbox" className="h-6 w-6" checked={onlyProtocol} onChange={(e) => setOnlyProtocol(e.target.checked)} />
          Only bags set up with this protocol
        </label>
      ) : null}

      {window.bags === 0 ? (
        <p className="text-body">No bags of this species have been started here yet. Once bags are checked, the days to first roots show here.</p>
      ) : (
        <>
          <dl className="grid grid-cols-3 gap-2 text-center">
            <Stat label="Half showed roots by" value={window.median !== null ? `day ${window.median}` : "not yet"} testId="history-median" />
            <Stat label="Earliest roots" value={window.earliest !== null ? `day ${window.earliest}` : "none yet"} />
            <Stat label="Bags" value={`${window.bags}`} hint={`${window.finished} with roots`} />
          </dl>
          <p className="text-label text-ink-soft">
            {describeSeasons(seasons).replace(/^s/, "S")}. Bags pulled, discarded or still chilling without roots count up to their last check (Kaplan–Meier), so
            they neither vanish nor count as roots.
            {window.published
              ? ` Published window: day ${window.published.minDays}${window.published.maxDays === null ? " or later" : window.published.maxDays === window.published.minDays ? "" : `–${window.published.maxDays}`}.`
              : ""}
          </p>
          <RootsCurveChart window={window} />
          {window.finished > 0 && window.median === null ? <p className="text-label">Fewer than half of these bags have shown roots so far: no median yet.</p> : null}
        </>
      )}

      {window.bags > 0 && !window.enough ? (
        <p className="text-label text-ink-soft">
          The farm&apos;s own window shows once {farmWindowMinFinishedBags} bags have shown roots (now {window.finished}).
        </p>
      ) : null}

      {window.enough && window.dailyFromDay !== null ? (
        <div className={`rounded-xl p-3 ${window.suggestsEarlier ? "bg-wheat-100" : "bg-rime-100"}`} data-testid="farm-window">
          <p className="text-body font-semibold">
            {window.suggestsEarlier
              ? `Start daily checks from day ${window.dailyFromDay}${window.published ? `, not day ${window.published.minDays}` : ""}.`
              : `The farm's roots come inside the published window: daily checks from day ${window.published?.minDays ?? window.dailyFromDay} still fit.`}
          </p>
          {window.suggestsEarlier ? (
            <p className="text-label">
              Here the first roots showed on day {window.earliest}, so look daily from a few days before. Bags already set up keep their pull window; Today asks for daily
              checks from that day.
            </p>
          ) : null}
          {mayAccept && !saved ? (
            <Button tone="primary" className="mt-2 w-full" disabled={busy} onClick={() => void accept()}>
              {existing ? "Update the farm's own protocol" : "Save as the farm's own protocol"}
            </Button>
          ) : null}
          {saved ? (
            <p className="mt-2 text-label font-semibold text-moss-700" role="status">
              Saved as the farm&apos;s own protocol for {saved.species}, citing this farm&apos;s record.{" "}
              <Link className="inline-flex min-h-tap items-center underline" href={`/protocols/view?id=${encodeURIComponent(saved.id)}`}>
                Open it
              </Link>
            </p>
          ) : null}
          <SaveError message={error} />
        </div>
      ) : null}
    </Card>
  );
}

function Stat({ label, value, hint, testId }: { label: string; value: string; hint?: string; testId?: string }) {
  return (
    <div className="rounded-xl bg-rime-100 p-2">
      <dt className="text-label text-ink-soft">{label}</dt>
      <dd className="text-title font-bold text-glacier-800" data-testid={testId}>
        {value}
      </dd>
      {hint ? <dd className="text-label text-ink-soft">{hint}</dd> : null}
    </div>
  );
}
