"use client";

import { CartesianGrid, Line, LineChart, ReferenceArea, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { Excursion, TemperatureUnit } from "@/lib/domain";
import type { BandInUnit, ChartPoint } from "./store-metrics";

const dayFmt = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short" });
const stampFmt = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" });

/** Readings over time with the store's band and its optimum shaded (none for a cold frame), and excursions marked. */
export function ReadingsChart({ points, band, unit, excursions }: { points: ChartPoint[]; band: BandInUnit | null; unit: TemperatureUnit; excursions: Excursion[] }) {
  if (points.length === 0) return <p className="py-10 text-center text-ink-soft">No readings in this period.</p>;
  const values = points.map((p) => p.value);
  const lo = Math.floor(Math.min(band?.band.min ?? Infinity, ...values) - 1);
  const hi = Math.ceil(Math.max(band?.band.max ?? -Infinity, ...values) + 1);
  const first = points[0].t;
  const last = points[points.length - 1].t;
  return (
    <figure>
      <div className="h-64 w-full" role="img" aria-label={`Temperature readings from ${dayFmt.format(first)} to ${dayFmt.format(last)}${band ? `, with the cold band ${band.band.min}–${band.band.max} °${unit} shaded` : ""}.`}>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={points} margin={{ top: 8, right: 8, bottom: 0, left: -16 }}>
            <CartesianGrid stroke="var(--color-rime-200)" strokeDasharray="2 4" />
            {band ? <ReferenceArea y1={band.band.min} y2={band.band.max} fill="var(--color-rime-200)" fillOpacity={0.6} ifOverflow="hidden" /> : null}
            {band ? <ReferenceArea y1={band.optimum.min} y2={band.optimum.max} fill="var(--color-glacier-400)" fillOpacity={0.22} ifOverflow="hidden" /> : null}
            {excursions.map((e) => (
              <ReferenceArea
                key={e.startAt}
                x1={Date.parse(e.startAt)}
                x2={Math.max(Date.parse(e.endAt), Date.parse(e.startAt) + 3_600_000)}
                fill="var(--color-ember-600)"
                fillOpacity={0.18}
                ifOverflow="hidden"
              />
            ))}
            <XAxis
              dataKey="t"
              type="number"
              scale="time"
              domain={[first, last]}
              tickFormatter={(t: number) => dayFmt.format(t)}
              tick={{ fontSize: 12, fill: "var(--color-ink-soft)" }}
              minTickGap={24}
            />
            <YAxis domain={[lo, hi]} allowDecimals={false} tick={{ fontSize: 12, fill: "var(--color-ink-soft)" }} unit="°" width={48} />
            <Tooltip
              labelFormatter={(t) => stampFmt.format(Number(t))}
              formatter={(v) => [`${Number(v).toFixed(1)} °${unit}`, "Reading"]}
            />
            <Line type="linear" dataKey="value" stroke="var(--color-glacier-700)" strokeWidth={2} dot={points.length < 60 ? { r: 2 } : false} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-label text-ink-soft">
        {band ? (
          <>
            <span className="inline-flex items-center gap-1.5">
              <span className="inline-block h-3 w-5 rounded-sm bg-rime-200" aria-hidden="true" /> band {band.band.min}–{band.band.max} °{unit}
            </span>
            <span className="inline-flex items-center gap-1.5">
              <span className="inline-block h-3 w-5 rounded-sm bg-glacier-400/40" aria-hidden="true" /> optimum {band.optimum.min}–{band.optimum.max} °{unit}
            </span>
          </>
        ) : null}
        {excursions.length ? (
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block h-3 w-5 rounded-sm bg-ember-600/30" aria-hidden="true" /> outside the band
          </span>
        ) : null}
      </figcaption>
    </figure>
  );
}
