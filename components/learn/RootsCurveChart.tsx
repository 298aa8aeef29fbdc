"use client";

import dynamic from "next/dynamic";
import type { FarmWindow } from "@/lib/domain/farm-history";

// recharts loads only when this chart is drawn; the placeholder holds its height so nothing jumps, and the
// chart's text equivalent (the label) is in the page from the start.
const RootsCurvePlot = dynamic(() => import("./RootsCurvePlot"), {
  ssr: false,
  loading: () => <div className="h-full w-full animate-pulse rounded-card bg-rime-100" aria-hidden="true" />,
});

/** Share of bags still without roots by day in the cold, beside the published window (drawn by RootsCurvePlot). */
export function RootsCurveChart({ window }: { window: FarmWindow }) {
  const pub = window.published;
  const label = `Share of ${window.bags} bags still without roots by day in the cold${window.median !== null ? `; half showed roots by day ${window.median}` : ""}${
    pub ? `; published window from day ${pub.minDays}${pub.maxDays !== null ? ` to ${pub.maxDays}` : ""}` : ""
  }.`;
  return (
    <div className="h-60 w-full" role="img" aria-label={label} data-testid="roots-curve">
      <RootsCurvePlot window={window} />
    </div>
  );
}
