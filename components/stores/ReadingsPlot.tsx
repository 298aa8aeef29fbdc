"use client";

import { CartesianGrid, Line, LineChart, ReferenceArea, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { Excursion } from "@/lib/domain/cold-exposure";
import type { TemperatureUnit } from "@/lib/domain/units";
import type { BandInUnit, ChartPoint } from "./store-metrics";

const dayFmt = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short" });
const stampFmt = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" });

/** The recharts drawing of ReadingsChart, loaded only when a store's readings are drawn (keeps recharts out of first loads). */
export default function ReadingsPlot({ points, band, unit, excursions, lo, hi }: { points: ChartPoint[]; band: BandInUnit | null; unit: TemperatureUnit; excursions: Excursion[]; lo: number; hi: number }) {
  const first = points[0].t;
  const last = points[points.length - 1].t;
  return (
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
  );
}
