import "server-only";
import webpush from "web-push";
import type { ReminderMessage } from "@/lib/schemas/reminder";
import { env } from "./env";

// Delivery to a phone's push service: the `web-push` package encrypts the message for the phone (RFC 8291,
// aes128gcm) and signs the VAPID header (RFC 8292); we make the POST ourselves (RFC 8030) so every request
// has a timeout and a slow or dead push service cannot hold up the others.

/** The push services browsers use. A subscription naming any other host is refused (the server would POST there). */
const knownPushServices = [
  /^fcm\.googleapis\.com$/, // Chrome, Android
  /^android\.googleapis\.com$/,
  /(^|\.)push\.services\.mozilla\.com$/, // Firefox
  /(^|\.)notify\.windows\.com$/, // Edge
  /(^|\.)push\.apple\.com$/, // Safari
];
const loopbackHosts = new Set(["127.0.0.1", "localhost", "[::1]"]);

/** True when the server may send to this push endpoint. */
export function isAcceptedEndpoint(endpoint: string): boolean {
  let url: URL;
  try {
    url = new URL(endpoint);
  } catch {
    return false;
  }
  if (url.username || url.password) return false;
  if (url.protocol === "https:" && url.port === "" && knownPushServices.some((r) => r.test(url.hostname))) return true;
  // The local fake push service of the tests and the demo, when explicitly allowed (never on an https deployment).
  return env.pushAllowLoopback && (url.protocol === "http:" || url.protocol === "https:") && loopbackHosts.has(url.hostname);
}

export type PushTarget = { endpoint: string; p256dh: string; auth: string };

export type Delivery =
  | { outcome: "delivered"; status: number }
  /** 404/410: the phone unsubscribed or the subscription expired; the row must go. */
  | { outcome: "gone"; status: number }
  | { outcome: "failed"; reason: "timeout" | "network" | "refused" | "http"; status?: number };

export type DeliverOptions = { timeoutMs?: number; ttlSeconds?: number; topic?: string };

/** Sends one encrypted message to one phone's push service. Never throws. */
export async function deliverPush(target: PushTarget, message: ReminderMessage, opts: DeliverOptions = {}): Promise<Delivery> {
  if (!env.vapid || !isAcceptedEndpoint(target.endpoint)) return { outcome: "failed", reason: "refused" };
  let details: ReturnType<typeof webpush.generateRequestDetails>;
  try {
    details = webpush.generateRequestDetails({ endpoint: target.endpoint, keys: { p256dh: target.p256dh, auth: target.auth } }, JSON.stringify(message), {
      vapidDetails: env.vapid,
      TTL: opts.ttlSeconds ?? 6 * 3600,
      urgency: "normal",
      // A newer reminder replaces one the phone has not fetched yet.
      ...(opts.topic ? { topic: opts.topic } : {}),
    });
  } catch {
    return { outcome: "failed", reason: "refused" }; // keys the encryption cannot use
  }
  const headers: Record<string, string> = {};
  for (const [k, v] of Object.entries(details.headers)) if (k.toLowerCase() !== "content-length") headers[k] = String(v);
  try {
    const res = await fetch(details.endpoint, {
      method: "POST",
      headers,
      body: details.body ? new Uint8Array(details.body) : null,
      redirect: "manual",
      signal: AbortSignal.timeout(opts.timeoutMs ?? 10_000),
    });
    await res.arrayBuffer().catch(() => undefined);
    if (res.status >= 200 && res.status < 300) return { outcome: "delivered", status: res.status };
    if (res.status === 404 || res.status === 410) return { outcome: "gone", status: res.status };
    return { outcome: "failed", reason: "http", status: res.status };
  } catch (err) {
    const name = (err as Error)?.name;
    return { outcome: "failed", reason: name === "TimeoutError" || name === "AbortError" ? "timeout" : "network" };
  }
}

/** Runs `fn` over `items` with at most `limit` at once, keeping the order of the answers. */
export async function mapWithConcurrency<T, R>(items: readonly T[], limit: number, fn: (item: T) => Promise<R>): Promise<R[]> {
  const out = new Array<R>(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await fn(items[i]);
    }
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(limit, items.length)) }, worker));
  return out;
}
