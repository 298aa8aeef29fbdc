import type { LabelledValue } from "@/lib/domain/germination";
import { WorkedOut } from "@/components/ui/WorkedOut";
import type { SowingSummary } from "./count-series";

const pct = (x: number) => `${(100 * x).toFixed(0)} %`;

function Metric({ v, unit, digits = 1 }: { v: LabelledValue; unit?: string; digits?: number }) {
  return (
    <div className="rounded-xl bg-rime-50 p-3">
      <dt className="text-label font-semibold text-ink">{v.label}</dt>
      <dd className="text-title font-bold text-glacier-800">{v.value === null ? "—" : `${v.value.toFixed(digits)}${unit ? ` ${unit}` : ""}`}</dd>
    </div>
  );
}

/** Germination with its Wilson interval, MGT, T50 and speed, each named by its formula and source. */
export function GerminationMetrics({ summary }: { summary: SowingSummary }) {
  const { metrics, interval } = summary;
  if (summary.problem) {
    return (
      <p role="alert" className="rounded-xl bg-ember-100 p-3 text-label text-ember-700">
        {summary.problem}
      </p>
    );
  }
  if (!metrics || !interval) return <p className="text-label text-ink-soft">Metrics appear after the first count.</p>;
  return (
    <div className="space-y-2">
    <dl className="grid grid-cols-1 gap-2 sm:grid-cols-2">
      <div className="rounded-xl bg-moss-100 p-3 sm:col-span-2">
        <dt className="text-label font-semibold text-ink">{metrics.germinationPercent.label}</dt>
        <dd className="text-display font-bold text-moss-700">{metrics.germinationPercent.value?.toFixed(0)} %</dd>
        <dd className="text-label text-ink">
          {metrics.germinated} of {metrics.sown} seeds · 95 % interval {pct(interval.lower)}–{pct(interval.upper)}
        </dd>
      </div>
      <Metric v={metrics.meanGerminationTime} unit="days" />
      <Metric v={metrics.t50Coolbear} unit="days" />
      <Metric v={metrics.maguireSpeed} unit="seeds/day" digits={2} />
      <Metric v={metrics.coefficientOfVelocity} digits={1} />
    </dl>
      <WorkedOut testId="germination-worked-out">
        <p>95 % interval: Wilson score interval (Wilson 1927).</p>
        {[metrics.germinationPercent, metrics.meanGerminationTime, metrics.t50Coolbear, metrics.maguireSpeed, metrics.coefficientOfVelocity].map((v) => (
          <p key={v.label}>
            {v.label}: <span className="font-mono">{v.formula}</span> · {v.source}
          </p>
        ))}
      </WorkedOut>
      {metrics.firstDay !== null ? (
        <p className="text-label text-ink-soft">
          First seedlings on day {metrics.firstDay}; most on day {metrics.peakDays.join(", ")}; last new ones on day {metrics.lastDay}.
        </p>
      ) : null}
    </div>
  );
}
