"use client";

import dynamic from "next/dynamic";
import type { SowingSummary } from "./count-series";

// recharts loads only when a curve is drawn; the placeholder holds its height, and the label is here from the start.
const GerminationPlot = dynamic(() => import("./GerminationPlot"), {
  ssr: false,
  loading: () => <div className="h-full w-full animate-pulse rounded-card bg-rime-100" aria-hidden="true" />,
});

/** Cumulative germination (% of seeds sown) by day since sowing. */
export function GerminationCurve({ curve, t50 }: { curve: SowingSummary["curve"]; t50: number | null }) {
  if (curve.length < 2) return <p className="py-6 text-center text-label text-ink-soft">The curve appears after the first count.</p>;
  const last = curve[curve.length - 1];
  return (
    <div className="h-52 w-full" role="img" aria-label={`Cumulative germination reached ${last.percent.toFixed(0)} % by day ${last.day} after sowing.`}>
      <GerminationPlot curve={curve} t50={t50} />
    </div>
  );
}
