import type { CSSProperties } from "react";
import type { PhaseKind } from "@/lib/schemas/words";
import { vocabularyLabels } from "@/lib/schemas/words";
import { formatDayWithWeekday, placeOnScale, type LaneStatus, type SeasonCountdown, type SeasonLane } from "./timeline";

// The season counted back from the last frost: each species a paper tag pinned to a frost rule. The tag says in
// words when the bag must go in and how much cold is still to come; under it (beside it on a desk) a cold gauge
// on the shared scale of weeks before frost: hatched = still to come, solid = done, a soil mound at sowing.

/** Still to come: pencil hatching in the phase's colour (taken from the element's text colour). */
const hatch: CSSProperties = { backgroundImage: "repeating-linear-gradient(135deg, currentColor 0 2px, transparent 2px 6px)" };

/** Colour of each phase: cold is glacier (frozen the darker), warm is soil, the untimed steps pencil. */
const phaseColour: Record<PhaseKind, { text: string; bg: string }> = {
  cold_moist: { text: "text-glacier-500", bg: "bg-glacier-500" },
  frozen: { text: "text-glacier-800", bg: "bg-glacier-800" },
  warm_moist: { text: "text-soil-600", bg: "bg-soil-600" },
  scarify: { text: "text-ink-soft", bg: "bg-ink-soft" },
  light: { text: "text-wheat-600", bg: "bg-wheat-600" },
};

/** Tone and glyph per lane state, after DEVELOPERS.md "Tones of work": trouble ember ✕, due wheat ▲, in the cold ❄. */
const statusLook: Record<LaneStatus, { glyph: string; text: string; edge: string }> = {
  late: { glyph: "✕", text: "text-ember-700", edge: "w-1.5 bg-ember-700" },
  due: { glyph: "▲", text: "text-wheat-700", edge: "w-1.5 bg-wheat-600" },
  waiting: { glyph: "○", text: "text-ink", edge: "border-l-2 border-dashed border-soil-600/50" },
  in_bag: { glyph: "❄", text: "text-glacier-800", edge: "w-1.5 bg-glacier-600" },
  done: { glyph: "✓", text: "text-moss-700", edge: "w-1.5 bg-moss-600" },
  no_cold: { glyph: "–", text: "text-ink-soft", edge: "border-l-2 border-rime-300" },
};

/** Tag and scale share one box model so the gauges line up under the ruler: words left, gauge right on a desk. */
const ROW = "pl-7 pr-3 lg:grid lg:grid-cols-[minmax(18rem,26rem)_1fr] lg:gap-x-6";

export function SeasonTimeline({ countdown, today }: { countdown: SeasonCountdown; today: string }) {
  const at = (daysBefore: number) => placeOnScale(countdown, daysBefore);
  const kinds = [...new Set(countdown.lanes.flatMap((l) => l.segments.map((s) => s.kind)))];
  const anyDone = countdown.lanes.some((l) => l.doneDays > 0);
  const anyLeadIn = countdown.lanes.some((l) => l.leadInBefore !== null);
  const fixedPoint =
    countdown.frostOn !== null
      ? `Counted back from the last frost, ${formatDayWithWeekday(countdown.frostOn, today)}${countdown.todayBefore !== null && countdown.todayBefore > 0 ? `: today is ${Math.floor(countdown.todayBefore / 7)} weeks before it` : ""}.`
      : "Counted back from each species' own sowing day (set the farm's last frost date to count from the frost).";
  return (
    <figure aria-labelledby="season-fixed-point" className="space-y-3">
      <p id="season-fixed-point" className="text-label text-ink-soft">
        {fixedPoint}
      </p>
      <div className={ROW} aria-hidden="true">
        <p className="hidden self-end text-label font-semibold text-ink-soft lg:block">Species</p>
        <FrostRule countdown={countdown} at={at} />
      </div>
      <ol className="space-y-3">
        {countdown.lanes.map((lane) => (
          <li key={lane.id}>
            <LaneTag lane={lane} at={at} />
          </li>
        ))}
      </ol>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 border-t border-dashed border-rime-300 pt-2 text-label text-ink-soft">
        {kinds.map((k) => (
          <span key={k} className="inline-flex items-center gap-1.5">
            <span className={`inline-block h-3 w-6 rounded-sm border-2 border-current ${phaseColour[k].text}`} style={hatch} aria-hidden="true" />
            {vocabularyLabels.phaseKind[k]} still to come
          </span>
        ))}
        {anyDone ? (
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block h-3 w-6 rounded-sm bg-glacier-800" aria-hidden="true" /> done
          </span>
        ) : null}
        {anyLeadIn ? (
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block w-6 border-t-2 border-dotted border-ink-soft" aria-hidden="true" /> may go in this early
          </span>
        ) : null}
        <span className="inline-flex items-center gap-1.5">
          <SowMark className="h-3.5 w-4" /> sowing day
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span className="text-ink" aria-hidden="true">▼</span> now
        </span>
      </figcaption>
    </figure>
  );
}

/** The shared scale: whole weeks before the anchor, the frost (or sowing) at its right-hand end, "now" pencilled on. */
function FrostRule({ countdown, at }: { countdown: SeasonCountdown; at: (d: number) => number }) {
  return (
    <div>
      <p className="flex flex-wrap justify-between gap-x-3 text-label text-ink-soft">
        <span>weeks before {countdown.anchorKind === "frost" ? "last frost" : "sowing"} →</span>
        <span className="font-semibold text-glacier-800">{countdown.anchorKind === "frost" ? (countdown.after === 0 ? "❄ last frost" : "❄ = last frost") : "sowing"}</span>
      </p>
      <div className="relative h-6 border-b-2 border-ink-soft/60 text-label font-semibold text-ink">
        {countdown.ticks.map((t, i) =>
          t.before <= 0 ? (
            <span key={t.before} className={`absolute bottom-0.5 text-glacier-800 ${countdown.after === 0 ? "-translate-x-full" : "-translate-x-1/2"}`} style={{ left: `${at(0)}%` }}>
              {countdown.anchorKind === "frost" ? "❄" : <SowMark className="inline h-3.5 w-4" />}
            </span>
          ) : (
            <span key={t.before} className={`absolute bottom-0.5 whitespace-nowrap ${i === 0 ? "" : "-translate-x-1/2"}`} style={{ left: `${at(t.before)}%` }}>
              {t.before / 7}
              <span className="hidden lg:inline"> wk</span>
            </span>
          ),
        )}
        {countdown.ticks.map((t) => (
          <span key={`tick-${t.before}`} className="absolute -bottom-1.5 h-2 border-l-2 border-ink-soft/60" style={{ left: `${at(t.before)}%` }} />
        ))}
      </div>
    </div>
  );
}

function LaneTag({ lane, at }: { lane: SeasonLane; at: (d: number) => number }) {
  const look = statusLook[lane.status];
  return (
    <div
      className={`relative rounded-r-xl bg-soil-100/60 py-2 lg:items-center ${ROW}`}
      // A kraft tag: chamfered corners at the string end and a punched hole.
      style={{ clipPath: "polygon(12px 0, 100% 0, 100% 100%, 12px 100%, 0 calc(100% - 12px), 0 12px)" }}
    >
      <span className={`absolute inset-y-0 left-0 ${look.edge}`} aria-hidden="true" />
      <span className="absolute left-3 top-3 h-2.5 w-2.5 rounded-full border-2 border-soil-600/60 bg-rime-50" aria-hidden="true" />
      <div className="min-w-0">
        <p className="font-semibold text-ink">{lane.label}</p>
        <p className={`text-label font-semibold ${look.text}`}>
          <span aria-hidden="true">{look.glyph} </span>
          {lane.headline}
        </p>
        <p className="text-label text-ink-soft">
          {lane.coldLine}
          {lane.startByBefore && lane.status !== "done" && lane.status !== "in_bag" ? ` · goes in ${lane.startByBefore}` : ""}
        </p>
        <p className="sr-only">{lane.spoken}</p>
      </div>
      <ColdGauge lane={lane} at={at} />
    </div>
  );
}

/** One lane on the shared scale: the phases end to end up to the sowing mound, done solid, to come hatched. */
function ColdGauge({ lane, at }: { lane: SeasonLane; at: (d: number) => number }) {
  let offset = 0;
  const parts = lane.segments.flatMap((s) => {
    const done = Math.max(0, Math.min(s.days, lane.doneDays - offset));
    offset += s.days;
    const colour = phaseColour[s.kind];
    const out: { key: string; left: number; width: number; style: CSSProperties; className: string }[] = [];
    if (done > 0) out.push({ key: `${s.from}-done`, left: at(s.startsBefore), width: at(s.startsBefore - done) - at(s.startsBefore), style: {}, className: colour.bg });
    if (done < s.days) {
      out.push({ key: `${s.from}-to-go`, left: at(s.startsBefore - done), width: at(s.endsBefore) - at(s.startsBefore - done), style: hatch, className: `border-2 border-current bg-white/70 ${colour.text}` });
    }
    return out;
  });
  const startBefore = lane.segments[0]?.startsBefore;
  const now = at(lane.todayBefore);
  return (
    <div className="relative mt-2 h-7 lg:mt-0" aria-hidden="true">
      {/* The ground line: frosty up to the anchor, open soil after it. */}
      <span className="absolute inset-x-0 top-1/2 border-t border-rime-300" />
      <span className="absolute top-1/2 h-1 -translate-y-1/2 bg-rime-200" style={{ left: 0, width: `${at(0)}%` }} />
      {lane.leadInBefore !== null && startBefore !== undefined ? (
        <span className="absolute top-1/2 border-t-2 border-dotted border-ink-soft" style={{ left: `${at(lane.leadInBefore)}%`, width: `${at(startBefore) - at(lane.leadInBefore)}%` }} />
      ) : null}
      {parts.map((p) => (
        <span key={p.key} className={`absolute inset-y-1 rounded-sm ${p.className}`} style={{ left: `${p.left}%`, width: `${Math.max(p.width, 0.8)}%`, ...p.style }} />
      ))}
      <SowMark className="absolute bottom-0 h-4 w-5 -translate-x-1/2" style={{ left: `${at(lane.sowBefore)}%` }} />
      {now >= 0 && now <= 100 ? (
        <span className="absolute -top-1.5 -translate-x-1/2 text-[0.7rem] leading-none text-ink" style={{ left: `${now}%` }}>
          ▼
        </span>
      ) : null}
    </div>
  );
}

/** Sowing day: a seed going into a small mound of soil (not a seedling: nothing has come up yet). */
function SowMark({ className, style }: { className: string; style?: CSSProperties }) {
  return (
    <svg viewBox="0 0 20 16" className={className} style={style} aria-hidden="true">
      <path d="M1 15c2-5 5-7 9-7s7 2 9 7Z" className="fill-soil-600" />
      <ellipse cx="10" cy="5" rx="2.6" ry="3.6" strokeWidth="1.4" className="fill-soil-100 stroke-soil-700" />
    </svg>
  );
}
