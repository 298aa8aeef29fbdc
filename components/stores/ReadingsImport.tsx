"use client";

import { useEffect, useState } from "react";
import { AppError } from "@/lib/errors";
import { decodeCsvBytes, maxCsvBytes, type CsvRowReport } from "@/lib/domain/csv";
import { parseReadingsCsv, type ReadingsCsvReport } from "@/lib/domain/csv-readings";
import type { TemperatureUnit } from "@/lib/domain/units";
import { Button } from "@/components/ui/Button";
import { Field, Select } from "@/components/ui/Field";
import { syncNowSoon } from "@/lib/client/sync-signal";
import { useOnline } from "@/lib/client/hooks";
import { ImportRowReport } from "./ImportRowReport";
import { Notice } from "@/components/season/Notice";

type Order = "auto" | "dmy" | "mdy";
type UnitChoice = "file" | TemperatureUnit;

/** What the server answered, in the shape both its success and its 422 carry. */
interface ServerReport {
  imported?: number;
  toImport?: number;
  message?: string;
  counts?: ReadingsCsvReport["counts"];
  rows?: CsvRowReport[];
  report?: Partial<ReadingsCsvReport>;
  error?: { code: string; message: string; fields?: Record<string, string> };
}

/**
 * A logger's CSV: pick the file, preview it on the phone with the same parser the server uses, then send it.
 * Imports need the server (all-or-nothing, duplicates checked against every reading), so this one screen calls fetch.
 */
export function ReadingsImport({ storeId, farmUnit, timeZone }: { storeId: string; farmUnit: TemperatureUnit; timeZone: string }) {
  const online = useOnline();
  const [file, setFile] = useState<File | null>(null);
  const [text, setText] = useState<string | null>(null);
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  const [order, setOrder] = useState<Order>("auto");
  const [unit, setUnit] = useState<UnitChoice>("file");
  const [sending, setSending] = useState(false);
  const [inputKey, setInputKey] = useState(0);
  const [serverCheck, setServerCheck] = useState<string | null>(null);
  const [result, setResult] = useState<{ ok: boolean; message: string; rows: CsvRowReport[] } | null>(null);

  const options = { unit: unit === "file" ? farmUnit : unit, dateOrder: order, timeZone, notAfter: new Date(Date.now() + 86_400_000).toISOString() };
  const preview = text === null ? null : parseReadingsCsv(text, options);

  async function pick(f: File | null) {
    setResult(null);
    setText(null);
    setFileProblem(null);
    setFile(f);
    if (!f) return;
    if (f.size > maxCsvBytes) {
      setFileProblem(`This file is ${(f.size / 1024 / 1024).toFixed(1)} MB; the most we take is ${maxCsvBytes / 1024 / 1024} MB. Split it into months and import each.`);
      return;
    }
    try {
      setText(decodeCsvBytes(new Uint8Array(await f.arrayBuffer())));
    } catch (e) {
      setFileProblem(e instanceof AppError ? e.message : "This file could not be read as text.");
    }
  }

  function endpoint(dryRun: boolean): string {
    const query = new URLSearchParams({ dateOrder: order, unit: unit === "file" ? farmUnit : unit, ...(dryRun ? { dryRun: "1" } : {}) });
    return `/api/stores/${storeId}/readings/import?${query}`;
  }

  async function post(dryRun: boolean): Promise<{ status: number; body: ServerReport }> {
    const res = await fetch(endpoint(dryRun), { method: "POST", headers: { "content-type": "text/csv" }, body: file, credentials: "same-origin" });
    return { status: res.status, body: (await res.json().catch(() => ({}))) as ServerReport };
  }

  // Once the phone's preview reads well, ask the server which readings it already has (nothing is written).
  const previewOk = preview?.ok ?? false;
  useEffect(() => {
    setServerCheck(null);
    if (!file || !previewOk || !online) return;
    let live = true;
    post(true)
      .then(({ status, body }) => {
        if (!live) return;
        if (status !== 200 || typeof body.toImport !== "number") {
          if (body.error) setServerCheck(body.error.message);
          return;
        }
        const known = (preview?.counts.ok ?? body.toImport) - body.toImport;
        setServerCheck(
          body.toImport === 0
            ? "Every reading in this file is already recorded."
            : known > 0
              ? `${body.toImport} new; ${known} already recorded will be skipped.`
              : `All ${body.toImport} are new to this store.`,
        );
      })
      .catch(() => undefined);
    return () => {
      live = false;
    };
  }, [file, previewOk, online, order, unit]);

  async function send() {
    if (!file) return;
    setSending(true);
    setResult(null);
    try {
      const { status, body } = await post(false);
      if (status === 200 || status === 201) {
        setResult({ ok: true, message: `${body.message ?? "Imported."} The chart updates as the phone syncs.`, rows: [] });
        setFile(null);
        setText(null);
        setInputKey((k) => k + 1);
        syncNowSoon();
      } else {
        setResult({
          ok: false,
          message: `Nothing was imported. ${body.error?.message ?? `The server answered ${status}.`}`,
          rows: (body.report?.rows ?? []).filter((r) => r.status !== "ok"),
        });
      }
    } catch {
      setResult({ ok: false, message: "Could not reach Rimebook. Imports need a connection; try again when you have signal.", rows: [] });
    } finally {
      setSending(false);
    }
  }

  return (
    <div className="space-y-3">
      {!online ? (
        <p role="status" className="rounded-xl bg-rime-100 p-3 text-label text-ink">
          No signal: importing a logger file needs a connection. You can still look at the chart and type readings by hand.
        </p>
      ) : null}
      <Field label="Logger file (CSV)" htmlFor="readings-file" hint="Time and temperature columns; °C or °F; common date formats.">
        <input
          key={inputKey}
          id="readings-file"
          type="file"
          accept=".csv,text/csv,text/plain"
          className="block w-full min-h-tap rounded-xl border-2 border-dashed border-rime-300 bg-paper p-3 text-label file:mr-3 file:min-h-tap file:rounded-lg file:border-0 file:bg-glacier-700 file:px-4 file:font-semibold file:text-white"
          onChange={(e) => void pick(e.target.files?.[0] ?? null)}
        />
      </Field>
      <Notice>{fileProblem}</Notice>
      {preview ? (
        <section aria-label="Preview" className="space-y-3 rounded-xl bg-rime-50 p-3">
          <div className="grid grid-cols-2 gap-3">
            <Field label="Dates are" htmlFor="readings-order">
              <Select id="readings-order" value={order} onChange={(e) => setOrder(e.target.value as Order)}>
                <option value="auto">Work it out</option>
                <option value="dmy">Day first (31/12/2026)</option>
                <option value="mdy">Month first (12/31/2026)</option>
              </Select>
            </Field>
            <Field label="Temperatures in" htmlFor="readings-unit">
              <Select id="readings-unit" value={unit} onChange={(e) => setUnit(e.target.value as UnitChoice)}>
                <option value="file">As the file says (else °{farmUnit})</option>
                <option value="C">°C</option>
                <option value="F">°F</option>
              </Select>
            </Field>
          </div>
          <p className="text-body font-semibold">
            {preview.counts.ok} reading{preview.counts.ok === 1 ? "" : "s"} to import
            {preview.counts.duplicates ? `, ${preview.counts.duplicates} repeated in the file` : ""}
            {preview.counts.errors ? `, ${preview.counts.errors} row${preview.counts.errors === 1 ? "" : "s"} to fix` : ""}.
          </p>
          {preview.problems.map((p) => (
            <p key={p} role="alert" className="text-label font-medium text-ember-700">
              {p}
            </p>
          ))}
          <ul className="list-disc space-y-1 pl-5 text-label text-ink-soft">
            {preview.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
          <ImportRowReport rows={preview.rows} />
          {serverCheck ? <p className="text-label font-medium text-glacier-800">{serverCheck}</p> : null}
          {!preview.ok && preview.counts.errors ? (
            <p className="text-label text-ink">Fix these rows in the file and pick it again: the import takes the whole file or nothing.</p>
          ) : null}
          <Button className="w-full" disabled={!preview.ok || !online || sending} onClick={() => void send()}>
            {sending ? "Importing…" : `Import ${preview.counts.ok} readings`}
          </Button>
        </section>
      ) : null}
      {result ? (
        <div role={result.ok ? "status" : "alert"} className={`rounded-xl p-3 text-label ${result.ok ? "bg-moss-100 text-moss-700" : "bg-ember-100 text-ember-700"}`}>
          <p className="font-semibold">{result.message}</p>
          {result.rows.length ? <ImportRowReport rows={result.rows} /> : null}
        </div>
      ) : null}
    </div>
  );
}
