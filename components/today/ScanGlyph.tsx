/** Rimebook's scan glyph: four frost-corner brackets around a small square of "modules". Drawn for this app. */
export function ScanGlyph({ className = "h-7 w-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" fill="none" stroke="currentColor" strokeWidth="2.6" strokeLinecap="round">
      <path d="M4 11V6a2 2 0 0 1 2-2h5M21 4h5a2 2 0 0 1 2 2v5M28 21v5a2 2 0 0 1-2 2h-5M11 28H6a2 2 0 0 1-2-2v-5" />
      <path d="M11 11h4v4h-4zM17 17h4v4h-4zM17 11h4M11 21h2" strokeWidth="2.2" />
    </svg>
  );
}
