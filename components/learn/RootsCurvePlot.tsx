"use client";

import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { FarmWindow } from "@/lib/domain/farm-history";
import { toCurvePoints } from "./curve-points";

/**
 * The recharts drawing of RootsCurveChart: share of bags still without roots by day in the cold (Kaplan–Meier
 * step line) with its 95 % band, and the published window shaded on the same day axis. Loaded lazily.
 */
export default function RootsCurvePlot({ window }: { window: FarmWindow }) {
  const points = toCurvePoints(window);
  const last = points[points.length - 1]?.day ?? 0;
  const pub = window.published;
  const right = Math.max(last, pub ? (pub.maxDays ?? pub.minDays + 14) : 0) + 3;
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={points} margin={{ top: 22, right: 12, bottom: 4, left: 0 }}>
        <CartesianGrid stroke="var(--color-rime-200)" strokeDasharray="2 4" />
        {pub ? (
          <ReferenceArea
            x1={pub.minDays}
            x2={pub.maxDays !== null && pub.maxDays > pub.minDays ? pub.maxDays : Math.min(right, pub.maxDays === null ? right : pub.minDays + 1)}
            fill="var(--color-wheat-600)"
            fillOpacity={0.18}
            ifOverflow="hidden"
            label={{ value: "published", position: "insideTopLeft", fontSize: 11, fill: "var(--color-wheat-700)" }}
          />
        ) : null}
        <XAxis dataKey="day" type="number" domain={[0, right]} allowDecimals={false} tick={{ fontSize: 12, fill: "var(--color-ink-soft)" }} label={{ value: "days in the cold", position: "insideBottomRight", offset: -2, fontSize: 12 }} />
        <YAxis domain={[0, 100]} unit="%" tick={{ fontSize: 12, fill: "var(--color-ink-soft)" }} width={48} />
        <Area type="stepAfter" dataKey="band" stroke="none" fill="var(--color-glacier-400)" fillOpacity={0.25} isAnimationActive={false} />
        {window.median !== null ? (
          <ReferenceLine x={window.median} stroke="var(--color-glacier-700)" strokeDasharray="4 3" label={{ value: `median ${window.median}`, position: "top", fontSize: 12, fill: "var(--color-glacier-800)" }} />
        ) : null}
        <Tooltip
          labelFormatter={(d) => `Day ${d}`}
          formatter={(v, name) => (name === "band" && Array.isArray(v) ? [`${Number(v[0]).toFixed(0)}–${Number(v[1]).toFixed(0)} %`, "95 % interval"] : [`${Number(v).toFixed(0)} %`, "Still without roots"])}
        />
        <Line type="stepAfter" dataKey="share" stroke="var(--color-glacier-800)" strokeWidth={2.5} dot={false} isAnimationActive={false} />
      </ComposedChart>
    </ResponsiveContainer>
  );
}
