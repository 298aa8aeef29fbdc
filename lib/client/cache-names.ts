// Cache names shared by the service worker (sw/) and the phone's sign-out, which empties every cache
// that may hold farm data and keeps the ones that hold only the app itself.

/** Per-build screen payloads for navigating offline (sw/screens.ts): the app's own screens, no farm data. */
export const SCREENS_CACHE_PREFIX = "rimebook-screens-";
