import type { ReminderState, ReminderTime } from "@/lib/schemas/reminder";
import { getLocalDb } from "./db";
import { deviceIdOf } from "./meta";

// Reminders on this phone, the browser side: notification permission (asked only when the person taps
// "Remind me on this phone"), the browser's push subscription made with the server's public key, and the
// /api/reminders calls. The Settings screen uses only these functions.

export type ReminderCall<T> = { ok: true; data: T } | { ok: false; status: number; message: string };

/** What this browser can do: reminders need a service worker, the Push API and notifications. */
export function readPushSupport(): { supported: boolean; permission: NotificationPermission | "unsupported" } {
  if (typeof window === "undefined") return { supported: false, permission: "unsupported" };
  const supported = "serviceWorker" in navigator && "PushManager" in window && "Notification" in window;
  return { supported, permission: supported ? Notification.permission : "unsupported" };
}

async function call<T>(method: string, path: string, body?: unknown): Promise<ReminderCall<T>> {
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      credentials: "same-origin",
      cache: "no-store",
      ...(body === undefined ? {} : { headers: { "content-type": "application/json" }, body: JSON.stringify(body) }),
    });
  } catch {
    return { ok: false, status: 0, message: "No connection right now. Setting up reminders needs signal; try again when you have some." };
  }
  const data = await res.json().catch(() => null);
  if (res.ok) return { ok: true, data: data as T };
  return { ok: false, status: res.status, message: data?.error?.message ?? "Something went wrong on our side. Please try again in a moment." };
}

export async function loadReminderState(): Promise<ReminderCall<ReminderState>> {
  const deviceId = await deviceIdOf(getLocalDb());
  return call<ReminderState>("GET", `/api/reminders?deviceId=${encodeURIComponent(deviceId)}`);
}

/** The VAPID public key (URL-safe base64) as the bytes PushManager.subscribe wants. */
function keyBytes(base64url: string): Uint8Array<ArrayBuffer> {
  const b64 = base64url.replace(/-/g, "+").replace(/_/g, "/").padEnd(Math.ceil(base64url.length / 4) * 4, "=");
  const raw = atob(b64);
  const out = new Uint8Array(new ArrayBuffer(raw.length));
  for (let i = 0; i < raw.length; i++) out[i] = raw.charCodeAt(i);
  return out;
}

function sameKey(sub: PushSubscription, publicKey: string): boolean {
  const have = sub.options?.applicationServerKey;
  if (!have) return true; // the browser does not tell: keep it
  const want = keyBytes(publicKey);
  const got = new Uint8Array(have);
  return got.length === want.length && got.every((b, i) => b === want[i]);
}

/**
 * "Remind me on this phone": asks for permission (call it from the tap itself), subscribes with the server's key
 * (or reuses this browser's subscription) and saves it with the hour and days.
 */
export async function remindMeOnThisPhone(publicKey: string, time: ReminderTime): Promise<ReminderCall<ReminderTime>> {
  const { supported } = readPushSupport();
  if (!supported) return { ok: false, status: 0, message: "This browser cannot show reminders. On an iPhone, add Rimebook to the Home Screen first, then open it from there." };
  const permission = await Notification.requestPermission();
  if (permission !== "granted") {
    return { ok: false, status: 0, message: "Notifications are not allowed for Rimebook. Allow them in this browser's site settings, then tap again." };
  }
  let subscription: PushSubscription;
  try {
    const registration = await navigator.serviceWorker.ready;
    let existing = await registration.pushManager.getSubscription();
    if (existing && !sameKey(existing, publicKey)) {
      await existing.unsubscribe();
      existing = null;
    }
    subscription = existing ?? (await registration.pushManager.subscribe({ userVisibleOnly: true, applicationServerKey: keyBytes(publicKey) }));
  } catch {
    return { ok: false, status: 0, message: "This phone's push service could not be reached. Check the connection and try again." };
  }
  return saveReminderTime(time, subscription);
}

/** Saves a new hour and days (this phone's subscription goes along, as it may have been renewed). */
export async function saveReminderTime(time: ReminderTime, subscription?: PushSubscription | null): Promise<ReminderCall<ReminderTime>> {
  const sub = subscription ?? (await currentSubscription());
  if (!sub) return { ok: false, status: 0, message: "This phone is not set up for reminders yet. Tap “Remind me on this phone”." };
  const deviceId = await deviceIdOf(getLocalDb());
  return call<ReminderTime>("PUT", "/api/reminders", { deviceId, subscription: sub.toJSON(), hour: time.hour, days: time.days });
}

/**
 * On opening Settings: the browser may have renewed this phone's subscription (a new endpoint) or dropped it.
 * A renewed one is saved at once; a dropped one means reminders no longer reach this phone.
 */
export async function checkThisPhone(here: ReminderState["here"]): Promise<"ok" | "renewed" | "lost"> {
  if (!here || readPushSupport().permission !== "granted") return "ok";
  const sub = await currentSubscription().catch(() => null);
  if (!sub) return "lost";
  if (sub.endpoint === here.endpoint) return "ok";
  return (await saveReminderTime(here, sub)).ok ? "renewed" : "ok";
}

async function currentSubscription(): Promise<PushSubscription | null> {
  if (!readPushSupport().supported) return null;
  // getRegistration, not ready: with no service worker (development) `ready` never settles.
  const registration = await navigator.serviceWorker.getRegistration();
  return (await registration?.pushManager.getSubscription()) ?? null;
}

/**
 * Stops reminders from this farm on this phone. The browser's subscription stays: it may serve the person's
 * other farm on this phone; a subscription nobody uses is never sent to.
 */
export async function stopRemindersOnThisPhone(): Promise<ReminderCall<{ removed: number }>> {
  const deviceId = await deviceIdOf(getLocalDb());
  return call("DELETE", "/api/reminders", { deviceId });
}

export async function sendTestReminder(): Promise<ReminderCall<{ delivered: boolean }>> {
  const deviceId = await deviceIdOf(getLocalDb());
  return call("POST", "/api/reminders/test", { deviceId });
}

/** At sign-out: the phone no longer belongs to the person, so its browser subscription goes too. */
export async function dropPushSubscription(): Promise<void> {
  try {
    const sub = await currentSubscription();
    await sub?.unsubscribe();
  } catch {
    /* no push on this browser, or already gone */
  }
}
