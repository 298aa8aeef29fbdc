import type { ButtonHTMLAttributes } from "react";

/** A filter chip: a toggle button (aria-pressed) big enough for a gloved thumb; a tick, not only colour, shows it is on. */
export function Chip({ pressed, className = "", children, ...rest }: ButtonHTMLAttributes<HTMLButtonElement> & { pressed: boolean }) {
  const look = pressed ? "border-glacier-700 bg-glacier-700 text-white" : "border-rime-300 bg-paper text-ink hover:bg-rime-100";
  return (
    <button type="button" aria-pressed={pressed} className={`inline-flex min-h-tap shrink-0 items-center gap-1.5 rounded-full border-2 px-3.5 text-label font-semibold ${look} ${className}`} {...rest}>
      {pressed ? <span aria-hidden="true">✓</span> : null}
      {children}
    </button>
  );
}
