// Waits until the app answers its health check, so `npm run demo` prints the sign-in banner only when a browser
// can really open the address (next start takes a few seconds on a slow machine).

export interface WaitOptions {
  timeoutMs?: number;
  intervalMs?: number;
  /** Stop waiting early (the server process exited). */
  gaveUp?: () => boolean;
}

/** Resolves true once GET `url` answers 2xx; false after the timeout or when `gaveUp` says so. */
export async function waitForApp(url: string, { timeoutMs = 120_000, intervalMs = 250, gaveUp }: WaitOptions = {}): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (gaveUp?.()) return false;
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(5_000) });
      await res.body?.cancel();
      if (res.ok) return true;
    } catch {
      // Not listening yet.
    }
    await new Promise((r) => setTimeout(r, intervalMs));
  }
  return false;
}
