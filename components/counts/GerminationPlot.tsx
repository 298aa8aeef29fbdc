"use client";

import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { SowingSummary } from "./count-series";

/** The recharts drawing of GerminationCurve, loaded only when a sowing's curve is drawn (keeps recharts out of first loads). */
export default function GerminationPlot({ curve, t50 }: { curve: SowingSummary["curve"]; t50: number | null }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={curve} margin={{ top: 22, right: 12, bottom: 4, left: 0 }}>
        <CartesianGrid stroke="var(--color-rime-200)" strokeDasharray="2 4" />
        <XAxis dataKey="day" type="number" domain={[0, "dataMax"]} allowDecimals={false} tick={{ fontSize: 12, fill: "var(--color-ink-soft)" }} label={{ value: "days since sowing", position: "insideBottomRight", offset: -2, fontSize: 12 }} />
        <YAxis domain={[0, 100]} unit="%" tick={{ fontSize: 12, fill: "var(--color-ink-soft)" }} width={48} />
        {t50 !== null ? <ReferenceLine x={t50} stroke="var(--color-wheat-600)" strokeDasharray="4 3" label={{ value: "T50", position: "top", fontSize: 12, fill: "var(--color-wheat-700)" }} /> : null}
        <Tooltip labelFormatter={(d) => `Day ${d}`} formatter={(v) => [`${Number(v).toFixed(1)} %`, "Germinated so far"]} />
        <Line type="stepAfter" dataKey="percent" stroke="var(--color-moss-600)" strokeWidth={2.5} dot={{ r: 3 }} isAnimationActive={false} />
      </LineChart>
    </ResponsiveContainer>
  );
}
