"use client";

import dynamic from "next/dynamic";
import type { Excursion } from "@/lib/domain/cold-exposure";
import type { TemperatureUnit } from "@/lib/domain/units";
import type { BandInUnit, ChartPoint } from "./store-metrics";

const dayFmt = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short" });

// recharts loads only when readings are drawn; the placeholder holds the plot's height so nothing jumps, and the
// figure's text (label and key) is here, outside the lazy part, so it is in the page from the start.
const ReadingsPlot = dynamic(() => import("./ReadingsPlot"), {
  ssr: false,
  loading: () => <div className="h-full w-full animate-pulse rounded-card bg-rime-100" aria-hidden="true" />,
});

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
        <ReadingsPlot points={points} band={band} unit={unit} excursions={excursions} lo={lo} hi={hi} />
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
