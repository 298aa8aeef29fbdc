// Rimebook's own navigation glyphs, drawn for the app (24×24, stroke follows currentColor).
const common = { viewBox: "0 0 24 24", fill: "none", stroke: "currentColor", strokeWidth: 2, strokeLinecap: "round", strokeLinejoin: "round", "aria-hidden": true } as const;

export function TodayGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <rect x="4" y="5" width="16" height="15" rx="3" />
      <path d="M8 3v4M16 3v4M4 10h16M9 15l2 2 4-4" />
    </svg>
  );
}

export function ScanGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <path d="M4 8V6a2 2 0 0 1 2-2h2M16 4h2a2 2 0 0 1 2 2v2M20 16v2a2 2 0 0 1-2 2h-2M8 20H6a2 2 0 0 1-2-2v-2" />
      <path d="M8 9h2v2H8zM14 9h2v2h-2zM8 13h2v2H8zM13 14h3" />
    </svg>
  );
}

export function BagsGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <path d="M6 7h12l-1 12a2 2 0 0 1-2 2H9a2 2 0 0 1-2-2z" />
      <path d="M5 4h14v3H5zM10 12h4" />
    </svg>
  );
}

export function SeasonGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <path d="M12 21v-9M12 12c0-4 3-6 7-6 0 4-3 6-7 6zM12 15c0-3-2-5-6-5 0 3 2 5 6 5z" />
    </svg>
  );
}

export function MoreGlyph({ className = "h-6 w-6" }: { className?: string }) {
  return (
    <svg {...common} className={className}>
      <circle cx="5" cy="12" r="1.4" />
      <circle cx="12" cy="12" r="1.4" />
      <circle cx="19" cy="12" r="1.4" />
    </svg>
  );
}
