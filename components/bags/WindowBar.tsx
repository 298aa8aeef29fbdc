
import { computeWindowBarGeometry, type WindowBarInput } from "./window-bar-geometry";
import { formatShortDay } from "./format-day";

// Rimebook's window bar: a frosted track from the start day, a wheat band where the bag may be pulled,
// an open end that fades out when no latest day is known, a dashed band for the window moved by lost cold,
// and a needle for today. Words under the bar say the same thing for screen readers and bright sun.

const phaseWords = {
  before_start: "not started yet",
  chilling: "chilling",
  in_window: "inside the pull window",
  past_window: "past the latest pull day",
} as const;

/** `today` is where the needle stands; for a pulled or discarded bag pass that day and its `markerLabel`. */
export function WindowBar(props: WindowBarInput & { className?: string; markerLabel?: string }) {
  const marker = props.markerLabel ?? "Today";
  const g = computeWindowBarGeometry(props);
  const { startedOn, opensOn, closesOn, shifted } = props;
  const label =
    `Started ${formatShortDay(startedOn)}; window opens ${formatShortDay(opensOn)}` +
    (closesOn ? ` and closes ${formatShortDay(closesOn)}` : " with no latest day") +
    (shifted ? `; moved to ${formatShortDay(shifted.opensOn)}${shifted.closesOn ? `–${formatShortDay(shifted.closesOn)}` : ""} for lost cold` : "") +
    (marker === "Today" ? `; today is day ${g.today.dayNumber}, ${phaseWords[g.today.phase]}.` : `; ${marker.toLowerCase()} on day ${g.today.dayNumber}.`);
  const needleClass = g.today.phase === "past_window" ? "bg-ember-600" : "bg-ink";
  return (
    <figure className={props.className} aria-label={label} role="img">
      <div className="relative h-11 pt-5">
        {/* today's needle label */}
        <span
          className="absolute top-0 -translate-x-1/2 whitespace-nowrap text-label font-semibold text-ink"
          style={{ left: `${Math.min(88, Math.max(12, g.today.pct))}%` }}
          aria-hidden="true"
        >
          {g.today.phase === "before_start" ? "Starts later" : `${marker} · day ${g.today.dayNumber}`}
        </span>
        <div className="relative h-5 overflow-hidden rounded-full bg-rime-200" aria-hidden="true">
          {/* frost track while chilling: fine diagonal hatching */}
          <div
            className="absolute inset-y-0 left-0"
            style={{
              width: `${g.chill.toPct}%`,
              backgroundImage: "repeating-linear-gradient(135deg, var(--color-rime-300) 0 2px, transparent 2px 7px)",
            }}
          />
          <div
            className="absolute inset-y-0 bg-wheat-600/80"
            style={{
              left: `${g.window.fromPct}%`,
              width: `${Math.max(1, g.window.toPct - g.window.fromPct)}%`,
              maskImage: g.window.openEnded ? "linear-gradient(to right, black 55%, transparent)" : undefined,
            }}
          />
          {g.shifted ? (
            <div
              className="absolute inset-y-0.5 rounded-full border-2 border-dashed border-glacier-700"
              style={{ left: `${g.shifted.fromPct}%`, width: `${Math.max(1, g.shifted.toPct - g.shifted.fromPct)}%` }}
            />
          ) : null}
        </div>
        <div className={`absolute bottom-0 top-4 w-1 -translate-x-1/2 rounded-full ${needleClass}`} style={{ left: `${g.today.pct}%` }} aria-hidden="true" />
      </div>
      <div className="mt-1 grid grid-cols-3 text-label text-ink-soft" aria-hidden="true">
        <span>
          <span className="block font-semibold text-ink">Start</span>
          {formatShortDay(startedOn)}
        </span>
        <span className="text-center">
          <span className="block font-semibold text-ink">Opens</span>
          {formatShortDay(opensOn)}
        </span>
        <span className="text-right">
          <span className="block font-semibold text-ink">Closes</span>
          {closesOn ? formatShortDay(closesOn) : "when roots show"}
        </span>
      </div>
      {shifted ? (
        <figcaption className="mt-1 text-label text-glacier-800">
          <span aria-hidden="true">┅ </span>Moved for lost cold: opens {formatShortDay(shifted.opensOn)}
          {shifted.closesOn ? `, closes ${formatShortDay(shifted.closesOn)}` : ""}.
        </figcaption>
      ) : null}
    </figure>
  );
}

