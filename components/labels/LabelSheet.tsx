"use client";

import { useSearchParams } from "next/navigation";
import { useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { buildBagRows, type BagRow } from "@/lib/domain/rows/bag-rows";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { cautionTexts } from "@/components/ui/Caution";
import { Field, Select } from "@/components/ui/Field";
import { StateBadge } from "@/components/ui/StateBadge";
import { getLocalDb } from "@/lib/client/db";
import { loadFarmRows } from "@/lib/client/fridge-reads";
import { formatIsoDay } from "@/lib/domain/dates";
import { a4Grid, buildLabels, drawQr, labelledStates, labelSizes, pageLabels, type LabelData, type LabelSize } from "./label-data";

// Pick bags and print their labels. Sizes are real millimetres/inches, so what prints is what is shown.

/** Seed, not food: the line every label with room carries, because the label stays with the bag in a shared fridge. */
const labelCaution = "Seed, not food. Keep sealed, away from children.";
/** The smallest type any label line may use (8 pt): below it a pencilled note or a warning is hard to read. */
const minimumPt = 8;

export function LabelSheet() {
  const params = useSearchParams();
  const idsParam = params.get("ids");
  const today = formatIsoDay(new Date());
  const farm = useLiveQuery(() => loadFarmRows(getLocalDb()), []);
  // Effective windows (moved by cold lost up to now), as Today and the bags table show them.
  const rows = useMemo(() => (farm ? buildBagRows(farm, today, { asOf: Date.now() }) : []), [farm, today]);

  const [size, setSize] = useState<LabelSize>((params.get("size") as LabelSize) in labelSizes ? (params.get("size") as LabelSize) : "a4");
  const [storeId, setStoreId] = useState<string>(params.get("store") ?? "");
  const [picked, setPicked] = useState<Set<string> | null>(idsParam ? new Set(idsParam.split(",").filter(Boolean)) : null);

  const candidates = useMemo(
    () => rows.filter((r) => (picked?.has(r.id) || labelledStates.includes(r.state)) && (!storeId || r.storeId === storeId)),
    [rows, picked, storeId],
  );
  // Until the grower changes it, every bag still in (or bound for) the cold is ticked.
  const chosen = picked ?? new Set(candidates.map((r) => r.id));
  const selectedRows = candidates.filter((r) => chosen.has(r.id));
  const origin = typeof window === "undefined" ? "" : window.location.origin;
  const labels = useMemo(() => (farm ? buildLabels(selectedRows, farm, origin) : []), [farm, selectedRows, origin]);

  // Each label is fitted in the preview, which is drawn at the real size: it first leaves out the start line, then
  // the lot, then uses smaller type (never under 8 pt). A label that still does not fit is named and not printed.
  const sheetRef = useRef<HTMLDivElement>(null);
  const [fits, setFits] = useState<Record<string, FitStep>>({});
  const [unfit, setUnfit] = useState<string[]>([]);
  const [fontsReady, setFontsReady] = useState(false);
  const fitKey = `${size}|${labels.map((l) => `${l.id}:${l.windowText}:${l.species}:${l.commonName}:${l.whereText}:${l.lotText}`).join("|")}|${fontsReady}`;
  useEffect(() => {
    void document.fonts?.ready.then(() => setFontsReady(true));
  }, []);
  useEffect(() => {
    setFits({});
    setUnfit([]);
  }, [fitKey]);
  useLayoutEffect(() => {
    const root = sheetRef.current;
    if (!root) return;
    const next = { ...fits };
    const tooBig: string[] = [];
    let changed = false;
    for (const el of root.querySelectorAll<HTMLElement>(".bag-label")) {
      const id = el.dataset.id ?? "";
      if (!overflows(el)) continue;
      const at = fitSteps.indexOf(next[id] ?? "full");
      if (at < fitSteps.length - 1) {
        next[id] = fitSteps[at + 1];
        changed = true;
      } else tooBig.push(id);
    }
    if (changed) setFits(next);
    else if (tooBig.join() !== unfit.join()) setUnfit(tooBig);
  });
  const unfitLabels = labels.filter((l) => unfit.includes(l.id));

  function toggle(id: string) {
    const next = new Set(chosen);
    if (next.has(id)) next.delete(id);
    else next.add(id);
    setPicked(next);
  }

  return (
    <div className="min-w-0 space-y-5">
      <style>{printCss(size)}</style>
      <div className="no-print space-y-4">
        <header>
          <h1 className="text-title font-bold text-glacier-800">Print bag labels</h1>
          <p className="text-label text-ink-soft">Each label carries a QR code your phone reads, the bag code in large type, species, lot, start date and pull window.</p>
        </header>
        <Card className="space-y-3">
          <Field label="Label size" htmlFor="label-size">
            <Select id="label-size" value={size} onChange={(e) => setSize(e.target.value as LabelSize)}>
              {(Object.keys(labelSizes) as LabelSize[]).map((k) => (
                <option key={k} value={k}>
                  {labelSizes[k].name}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Cold store" htmlFor="label-store">
            <Select id="label-store" value={storeId} onChange={(e) => setStoreId(e.target.value)}>
              <option value="">All cold stores</option>
              {farm?.stores.filter((s) => !s.deleted_at).map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </Select>
          </Field>
          <p className="text-label text-ink-soft">
            {size === "a4"
              ? `Print at 100 % (“actual size”), no margins; 21 labels per A4 sheet (top margin ${a4Grid.topMm} mm, left ${a4Grid.leftMm} mm).`
              : "Print at 100 % (“actual size”) to a label printer; one label per page."}
          </p>
          {unfitLabels.length ? (
            <div role="alert" className="rounded-card border-l-4 border-ember-600 bg-ember-100 p-3 text-label" data-testid="labels-unfit">
              <p className="font-semibold">
                {unfitLabels.length === 1 ? "This label does not fit" : `${unfitLabels.length} labels do not fit`} on {labelSizes[size].name.split(" (")[0]} without cutting words or going under {minimumPt} pt:
              </p>
              <p>{unfitLabels.map((l) => `${l.codeShown} (${l.commonName || l.species})`).join(", ")}</p>
              <p>Choose a larger label size, or untick {unfitLabels.length === 1 ? "it" : "them"} to print the rest.</p>
            </div>
          ) : null}
          {labels.length ? (
            <Button size="lg" className="w-full" disabled={unfitLabels.length > 0} onClick={() => window.print()}>
              Print {labels.length} {labels.length === 1 ? "label" : "labels"}
            </Button>
          ) : (
            <p className="text-label text-ink-soft">Tick at least one bag below to print its label.</p>
          )}
        </Card>
        <p className="rounded-card border-l-4 border-wheat-600 bg-wheat-100 p-3 text-label">
          <strong>On every label:</strong> “{labelCaution}” ({cautionTexts.foodFridge}) Toxic and treated seed is marked on the label itself, because the label stays with the bag in a shared fridge.
        </p>

        <fieldset className="min-w-0 space-y-2">
          <legend className="text-label font-semibold">Bags ({selectedRows.length} of {candidates.length} ticked)</legend>
          <div className="flex gap-2">
            <Button tone="quiet" onClick={() => setPicked(new Set(candidates.map((r) => r.id)))}>
              Tick all
            </Button>
            <Button tone="quiet" onClick={() => setPicked(new Set())}>
              Tick none
            </Button>
          </div>
          {farm && candidates.length === 0 ? <p className="text-ink-soft">No bags planned or in the cold here.</p> : null}
          <ul className="max-h-80 space-y-1 overflow-y-auto rounded-card border border-rime-200 bg-paper p-2">
            {candidates.map((r) => (
              <BagPick key={r.id} row={r} checked={chosen.has(r.id)} onToggle={() => toggle(r.id)} />
            ))}
          </ul>
        </fieldset>
        <h2 className="text-title font-bold text-glacier-800">Preview</h2>
      </div>

      {/* Focusable so a keyboard can scroll the real-size preview sideways. */}
      <div className="w-full max-w-[calc(100vw-2rem)] overflow-x-auto" tabIndex={0} role="region" aria-label="Label preview at real size">
        <div className="label-print" data-testid="label-sheet" ref={sheetRef}>
          {pageLabels(labels, size).map((page, i) => (
            <div key={i} className={`label-page label-page-${size}`}>
              {page.map((l) => (
                <BagLabel key={l.id} label={l} size={size} fit={fits[l.id] ?? "full"} />
              ))}
            </div>
          ))}
        </div>
      </div>
    </div>
  );
}

function BagPick({ row, checked, onToggle }: { row: BagRow; checked: boolean; onToggle: () => void }) {
  return (
    <li>
      <label className="flex min-h-tap cursor-pointer items-center gap-3 rounded-xl px-2 py-1 hover:bg-rime-50">
        <input type="checkbox" className="h-5 w-5 accent-glacier-700" checked={checked} onChange={onToggle} />
        <span className="font-mono font-bold tracking-wider">{row.codeShown}</span>
        <span className="min-w-0 flex-1 truncate text-label">{row.commonName || row.species}</span>
        <StateBadge state={row.state} />
      </label>
    </li>
  );
}

function QrSvg({ text, className }: { text: string; className: string }) {
  const qr = useMemo(() => drawQr(text), [text]);
  return (
    <svg viewBox={`0 0 ${qr.size} ${qr.size}`} className={className} role="img" aria-label={`QR code for ${text}`} shapeRendering="crispEdges">
      <rect width={qr.size} height={qr.size} fill="#fff" />
      <path d={qr.path} fill="#000" />
    </svg>
  );
}

/** How much a label gives up to fit, step by step: nothing, then the start line, then the lot, then a smaller type. */
export const fitSteps = ["full", "no-start", "no-lot", "small-type"] as const;
export type FitStep = (typeof fitSteps)[number];

/** Pencil boxes for checks when the phone is not at hand: a tick and a date, on labels with room. */
const tickBoxes: Record<LabelSize, number> = { small: 0, a4: 5, large: 6 };

function BagLabel({ label, size, fit }: { label: LabelData; size: LabelSize; fit: FitStep }) {
  const mark = label.treated ? "⚠ TREATED SEED" : label.toxic ? "⚠ TOXIC SEED" : null;
  const step = fitSteps.indexOf(fit);
  const name = size === "small" ? label.commonName || label.species : label.species;
  return (
    <article className={`bag-label bag-label-${size} ${fit === "small-type" ? "bag-label-smaller" : ""}`} data-id={label.id} data-code={label.code} data-fit={fit} aria-label={`Label for bag ${label.codeShown}`}>
      <QrSvg text={label.payload} className="bag-label-qr" />
      <div className="bag-label-text">
        <p className="bag-label-code">{label.codeShown}</p>
        <p className="bag-label-window">{label.windowText}</p>
        <p className="bag-label-species">
          {name}
          {size !== "small" && label.commonName ? <span className="bag-label-common"> · {label.commonName}</span> : null}
        </p>
        {label.whereText ? <p className="bag-label-line">{label.whereText}</p> : null}
        {size !== "small" && label.lotText && step < 2 ? <p className="bag-label-line">Lot: {label.lotText}</p> : null}
        {size !== "small" && step < 1 ? <p className="bag-label-line">{label.startText}</p> : null}
        {mark ? <p className="bag-label-mark">{mark}</p> : null}
        {size !== "small" ? <p className="bag-label-caution">{size === "large" ? labelCaution : "Seed, not food."}</p> : null}
      </div>
      {tickBoxes[size] ? (
        <div className="bag-label-ticks" aria-hidden="true">
          {Array.from({ length: tickBoxes[size] }, (_, i) => (
            <span key={i} className="bag-label-tick">
              <span className="bag-label-box" />
              <span className="bag-label-date">__/__</span>
            </span>
          ))}
        </div>
      ) : null}
    </article>
  );
}

/** True when a label's words spill past its edges (the preview is drawn at the real size, so paper does the same). */
function overflows(label: HTMLElement): boolean {
  const text = label.querySelector<HTMLElement>(".bag-label-text");
  const spill = (el: HTMLElement) => el.scrollHeight > el.clientHeight + 1 || el.scrollWidth > el.clientWidth + 1;
  return spill(label) || (text !== null && spill(text));
}

/** Page and label geometry per size. Real units (in, mm) so the printout matches the stock. */
function printCss(size: LabelSize): string {
  const s = labelSizes[size];
  const page =
    size === "a4"
      ? `@page { size: A4; margin: 0; }`
      : `@page { size: ${s.widthMm}mm ${s.heightMm}mm; margin: 0; }`;
  return `
.label-print { color: #000; font-family: var(--font-sans); }
.label-page { background: #fff; }
.label-page-a4 { width: 210mm; min-height: 297mm; box-sizing: border-box; padding: ${a4Grid.topMm}mm 0 0 ${a4Grid.leftMm}mm;
  display: grid; grid-template-columns: repeat(${a4Grid.columns}, ${s.widthMm}mm); grid-auto-rows: ${s.heightMm}mm; column-gap: ${a4Grid.columnGapMm}mm; align-content: start; }
.label-page-small, .label-page-large { width: ${s.widthMm}mm; height: ${s.heightMm}mm; margin-bottom: 4mm; }
.bag-label { width: ${s.widthMm}mm; height: ${s.heightMm}mm; box-sizing: border-box; overflow: hidden; display: grid;
  grid-template-columns: auto minmax(0, 1fr); grid-template-rows: ${size === "small" ? "minmax(0, 1fr)" : "minmax(0, 1fr) auto"}; column-gap: 1.5mm; row-gap: 0.8mm; align-items: start;
  padding: ${size === "small" ? "1mm" : "2mm"}; break-inside: avoid; page-break-inside: avoid; outline: 1px dashed #a9c3cf; outline-offset: -1px; }
.bag-label-qr { height: ${size === "large" ? "38mm" : size === "a4" ? "26mm" : "23.4mm"}; width: ${size === "large" ? "38mm" : size === "a4" ? "26mm" : "23.4mm"}; }
.bag-label-text { min-width: 0; height: 100%; overflow: hidden; line-height: 1.12; overflow-wrap: anywhere; }
.bag-label-code { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; font-weight: 800; letter-spacing: 0.03em;
  font-size: ${size === "large" ? "24pt" : size === "a4" ? "13pt" : "11pt"}; white-space: nowrap; }
.bag-label-window { font-weight: 800; font-size: ${size === "large" ? "15pt" : size === "a4" ? "10pt" : "9pt"}; }
.bag-label-species { font-weight: 700; font-size: ${size === "large" ? "11pt" : size === "a4" ? "8.5pt" : "8pt"}; }
.bag-label-common { font-weight: 500; }
.bag-label-line { font-size: ${size === "large" ? "9pt" : size === "a4" ? "8pt" : "8pt"}; }
.bag-label-mark { font-size: ${size === "large" ? "9pt" : size === "a4" ? "8pt" : "8pt"}; font-weight: 800; border: 0.3mm solid #000; display: inline-block; padding: 0 0.8mm; margin-top: 0.3mm; }
.bag-label-caution { font-size: 8pt; margin-top: 0.3mm; }
.bag-label-smaller .bag-label-code { font-size: ${size === "large" ? "18pt" : size === "a4" ? "11pt" : "10pt"}; }
.bag-label-smaller .bag-label-window { font-size: ${size === "large" ? "11pt" : "8pt"}; }
.bag-label-smaller .bag-label-species, .bag-label-smaller .bag-label-line, .bag-label-smaller .bag-label-mark { font-size: ${size === "large" ? "9pt" : "8pt"}; }
.bag-label-ticks { grid-column: 1 / -1; display: flex; justify-content: space-between; font-size: 8pt; line-height: 1; }
.bag-label-tick { display: inline-flex; align-items: center; gap: 0.6mm; }
.bag-label-box { display: inline-block; width: 2.8mm; height: 2.8mm; border: 0.3mm solid #000; }
.bag-label-date { color: #333; }
@media print {
  ${page}
  /* Only the labels take space on paper: hidden screen parts (header, form, padding) would otherwise flow onto
     extra blank pages, which a 2×1 in label roll prints as wasted labels. */
  body *:not(:has(.label-print)):not(.label-print):not(.label-print *) { display: none !important; }
  body, body *:has(.label-print) { margin: 0 !important; padding: 0 !important; min-height: 0 !important; border: 0 !important; box-shadow: none !important; }
  .label-page { break-after: page; page-break-after: always; margin: 0; }
  .label-page:last-child { break-after: auto; page-break-after: auto; }
  .bag-label { outline: none; }
}`;
}
