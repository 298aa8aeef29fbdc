// Repository writes nudge the sync loop without importing it (the loop imports the repositories' store).
let nudger: (() => void) | null = null;

export function setSyncNudger(fn: (() => void) | null): void {
  nudger = fn;
}

/** Ask the running sync loop (if any) to push soon; debounced there. */
export function nudgeSync(): void {
  nudger?.();
}
