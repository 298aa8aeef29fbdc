/** Rimebook's mark: a six-armed rime crystal over a closed book spine. Drawn for this app. */
export function RimeMark({ className = "h-8 w-8" }: { className?: string }) {
  return (
    <svg viewBox="0 0 48 48" className={className} aria-hidden="true" fill="none">
      <rect x="6" y="8" width="36" height="34" rx="6" fill="var(--color-glacier-700)" />
      <rect x="10" y="8" width="4" height="34" fill="var(--color-glacier-800)" />
      <g stroke="var(--color-rime-50)" strokeWidth="2.4" strokeLinecap="round">
        <path d="M28 15v20M19.3 20l17.4 10M19.3 30l17.4-10" />
        <path d="M28 15l-2.5 2.5M28 15l2.5 2.5M28 35l-2.5-2.5M28 35l2.5-2.5" />
      </g>
    </svg>
  );
}
