// Registering the service worker. The framework's own helper (window.serwist, set up by @serwist/next with
// `register: false`) throws an unhandled error when a browser has no service worker or blocks it (a
// private window, a locked-down work profile, a test browser): "Cannot read properties of undefined
// (reading 'waiting')" on every page. Rimebook works without one, only not offline, so registration
// is attempted here and any failure is reported as a state, never thrown.

export type WorkerRegistration = "registered" | "unsupported" | "failed";

type SerwistLike = { register: (opts?: { immediate?: boolean }) => Promise<unknown> };
type WindowLike = { navigator: Partial<Pick<Navigator, "serviceWorker">>; serwist?: SerwistLike };

declare global {
  interface Window {
    serwist?: SerwistLike;
  }
}

/** Registers the build's service worker when the browser has one; says what happened. */
export async function registerServiceWorker(win: WindowLike = window): Promise<WorkerRegistration> {
  const container = win.navigator.serviceWorker;
  // `next dev` has no worker (window.serwist is not set up there), and some browsers have no service workers at all.
  if (!container || typeof container.register !== "function" || !win.serwist) return "unsupported";
  try {
    await win.serwist.register();
    return "registered";
  } catch (err) {
    console.warn("[rimebook] this browser did not take the offline worker; Rimebook works, but not without signal", err);
    return "failed";
  }
}
