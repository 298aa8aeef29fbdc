// Rimebook's own navigation glyphs, drawn for the app from the things at the fridge (24×24, stroke follows
// currentColor): the fridge of today's round, a paper tag crossed by the scan line, a sealed seed bag with its
// tag, a seedling for the season, and the rime-and-book mark for the farm's own records and people.
const common = { viewBox: "0 0 24 24", fill: "none", stroke: "currentColor", strokeWidth: 2, strokeLinecap: "round", strokeLinejoin: "round", "aria-hidden": true } as const;

/** Today: a fridge door with its handle, a tick on the lower door (the round is done at the fridge). */
export function TodayGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <rect x="5.5" y="2.5" width="13" height="19" rx="2.5" />
      <path d="M5.5 9h13M8.5 5v2" />
      <path d="M9.5 15l2 2 3.5-3.5" />
    </svg>
  );
}

/** Scan: a bag's paper tag with its string hole, crossed by the reading line. */
export function ScanGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <path d="M8 5h11a1.5 1.5 0 0 1 1.5 1.5v11A1.5 1.5 0 0 1 19 19H8l-4.5-4.5v-5z" />
      <circle cx="7.5" cy="12" r="1" />
      <path d="M11 9.5v5M13.5 9.5v5M16.5 9.5v5" strokeWidth="1.6" />
      <path d="M1.5 12h1M21.5 12h1" />
    </svg>
  );
}

/** Bags: a sealed seed bag (the press seal across its top) with a tag tied to its corner. */
export function BagsGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <path d="M4 4h12v15.5a1.5 1.5 0 0 1-1.5 1.5h-9A1.5 1.5 0 0 1 4 19.5z" />
      <path d="M4 7.5h12" />
      <path d="M7 12.5c1 .8 2 .8 3 0s2-.8 3 0M7 16c1 .8 2 .8 3 0s2-.8 3 0" strokeWidth="1.5" />
      <path d="M16 5l3 2.5v5l-2 1.5-2-1.5" strokeWidth="1.6" />
    </svg>
  );
}

/** Season: a seedling with its two first leaves. */
export function SeasonGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <path d="M12 21v-9M12 12c0-4 3-6 7-6 0 4-3 6-7 6zM12 15c0-3-2-5-6-5 0 3 2 5 6 5z" />
      <path d="M8 21h8" />
    </svg>
  );
}

/** Farm: the rime-and-book mark drawn in line, a closed book with a rime crystal on its cover. */
export function FarmGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <rect x="4" y="3" width="16" height="18" rx="2" />
      <path d="M8 3v18" />
      <path d="M14 8v8M10.8 10l6.4 4M10.8 14l6.4-4" strokeWidth="1.6" />
    </svg>
  );
}
