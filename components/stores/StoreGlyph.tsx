import type { StoreKind } from "@/lib/schemas/words";

/** Rimebook's own small pictures of a store: a tall door, a chest with a lid, a glazed frame. Drawn for this app. */
export function StoreGlyph({ kind, className = "h-10 w-10 shrink-0" }: { kind: StoreKind; className?: string }) {
  return (
    <svg viewBox="0 0 40 40" className={className} aria-hidden="true" fill="none" strokeWidth="2.2" strokeLinecap="round" strokeLinejoin="round">
      <rect x="1" y="1" width="38" height="38" rx="10" fill="var(--color-rime-100)" stroke="none" />
      {kind === "fridge" ? (
        <g stroke="var(--color-glacier-700)">
          <rect x="12" y="7" width="16" height="26" rx="3" />
          <path d="M12 16h16M15 10.5v3M15 19.5v5" />
        </g>
      ) : kind === "freezer" ? (
        <g stroke="var(--color-glacier-800)">
          <rect x="7" y="15" width="26" height="16" rx="3" />
          <path d="M6 15h28M17 20h6" />
          <path d="M20 6v7M17 8l6 3M23 8l-6 3" />
        </g>
      ) : (
        <g stroke="var(--color-moss-700)">
          <path d="M7 30h26M9 30V20l22-6v16" />
          <path d="M16 18v12M24 16v14" />
        </g>
      )}
    </svg>
  );
}
