import type { PhaseKind } from "@/lib/schemas/vocabulary";
import { vocabularyLabels } from "@/lib/schemas/vocabulary";
import { formatShortDay } from "@/components/bags/format-day";
import type { Timeline } from "./timeline";

// Rimebook's own season picture: each species a lane, its phases as bars running up to a seedling mark on the
// sowing day, a faint lead-in where the bag may start earlier, and a dashed line for today.
export const phaseLook: Record<PhaseKind, { bar: string; swatch: string }> = {
  warm_moist: { bar: "bg-wheat-600", swatch: "bg-wheat-600" },
  cold_moist: { bar: "bg-glacier-500", swatch: "bg-glacier-500" },
  frozen: { bar: "bg-glacier-800", swatch: "bg-glacier-800" },
  scarify: { bar: "bg-ink-soft", swatch: "bg-ink-soft" },
  light: { bar: "bg-wheat-100", swatch: "bg-wheat-100" },
};

export function SeasonTimeline({ timeline }: { timeline: Timeline }) {
  const kinds = [...new Set(timeline.rows.flatMap((r) => r.bars.map((b) => b.kind)))];
  return (
    <figure aria-label={`Season timeline from ${formatShortDay(timeline.from)} to ${formatShortDay(timeline.to)}`}>
      <div className="relative">
        <div className="relative h-6 border-b border-rime-200 text-label text-ink-soft" aria-hidden="true">
          {timeline.months.map((m) => (
            <span key={`${m.left}`} className="absolute top-0 -translate-x-1/2 whitespace-nowrap" style={{ left: `${m.left}%` }}>
              {m.label}
            </span>
          ))}
        </div>
        <ol className="relative">
          {timeline.rows.map((r) => (
            <li key={r.id} className="relative py-1.5">
              <p className="truncate text-label font-semibold text-ink">{r.label}</p>
              <div className="relative h-5 rounded bg-rime-50">
                {r.leadIn ? <span className="absolute inset-y-1 rounded-l bg-glacier-400/25" style={{ left: `${r.leadIn.left}%`, width: `${r.leadIn.width}%` }} title="May start from here" /> : null}
                {r.bars.map((b) => (
                  <span
                    key={`${b.kind}-${b.from}`}
                    className={`absolute inset-y-0.5 rounded ${phaseLook[b.kind].bar}`}
                    style={{ left: `${b.left}%`, width: `${Math.max(b.width, 0.8)}%` }}
                    title={`${vocabularyLabels.phaseKind[b.kind]}: start by ${formatShortDay(b.from)}, until ${formatShortDay(b.to)}`}
                  />
                ))}
                <SeedlingMark left={r.sow} />
              </div>
              <span className="sr-only">
                {r.bars.map((b) => `${vocabularyLabels.phaseKind[b.kind]} from ${formatShortDay(b.from)}`).join(", ")}; sow {formatShortDay(r.sowOn)}.
              </span>
            </li>
          ))}
        </ol>
        {timeline.today !== null ? (
          <div className="pointer-events-none absolute bottom-0 top-6 border-l-2 border-dashed border-ember-600" style={{ left: `${timeline.today}%` }} aria-hidden="true">
            <span className="absolute -bottom-1 left-1 rounded bg-ember-100 px-1 text-[0.7rem] font-bold text-ember-700">today</span>
          </div>
        ) : null}
      </div>
      <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-label text-ink-soft">
        {kinds.map((k) => (
          <span key={k} className="inline-flex items-center gap-1.5">
            <span className={`inline-block h-3 w-5 rounded-sm ${phaseLook[k].swatch}`} aria-hidden="true" /> {vocabularyLabels.phaseKind[k]}
          </span>
        ))}
        <span className="inline-flex items-center gap-1.5">
          <svg viewBox="0 0 12 12" className="h-3 w-3" aria-hidden="true">
            <path d="M6 11V5M6 6C6 3 3.5 2 2 2c0 2 1.5 4 4 4Zm0 0c0-3 2.5-4 4-4 0 2-1.5 4-4 4Z" fill="var(--color-moss-600)" stroke="var(--color-moss-700)" strokeWidth="1" />
          </svg>
          sowing day
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span className="inline-block h-3 w-5 rounded-sm bg-glacier-400/25" aria-hidden="true" /> may start earlier
        </span>
      </figcaption>
    </figure>
  );
}

function SeedlingMark({ left }: { left: number }) {
  return (
    <svg viewBox="0 0 12 12" className="absolute top-1/2 h-4 w-4 -translate-x-1/2 -translate-y-1/2" style={{ left: `${left}%` }} aria-hidden="true">
      <circle cx="6" cy="6" r="5.5" fill="white" />
      <path d="M6 11V5M6 6C6 3 3.5 2 2 2c0 2 1.5 4 4 4Zm0 0c0-3 2.5-4 4-4 0 2-1.5 4-4 4Z" fill="var(--color-moss-600)" stroke="var(--color-moss-700)" strokeWidth="1" />
    </svg>
  );
}
