"use client";

import { useEffect, useState } from "react";

// A module a screen needs only once its data is read (the round's computations, the check form): kept out of
// the screen's first load and fetched as soon as the screen's script runs, in parallel with hydration and the
// phone-store read. Every chunk is in the service worker's precache, so this works with no signal.

export type LazyModule<T> = { load: () => Promise<T>; peek: () => T | undefined };

/** Starts loading at once in the browser (not on the server); `load` retries after a failed fetch. */
export function lazyModule<T>(importer: () => Promise<T>): LazyModule<T> {
  let pending: Promise<T> | null = null;
  let value: T | undefined;
  const load = () =>
    (pending ??= importer().then(
      (m) => (value = m),
      (e: unknown) => {
        pending = null;
        throw e;
      },
    ));
  if (typeof window !== "undefined") void load().catch(() => undefined);
  return { load, peek: () => value };
}

/** The module once loaded (undefined until then, and while the page is prerendered). */
export function useLazyModule<T>(m: LazyModule<T>): T | undefined {
  const [value, setValue] = useState<T | undefined>(undefined);
  useEffect(() => {
    let live = true;
    void m.load().then((v) => live && setValue(() => v));
    return () => {
      live = false;
    };
  }, [m]);
  return value;
}
