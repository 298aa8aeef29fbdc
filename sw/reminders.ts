/// <reference lib="webworker" />
import type { ReminderMessage } from "@/lib/schemas/reminder";

// Phone reminders in the service worker: a push from the server (already decrypted by the browser) becomes a
// notification with Rimebook's icon, even when the app is closed; tapping it opens Today, in the app's open
// window when there is one. Kept apart from the caching set-up in sw/index.ts.

declare const self: ServiceWorkerGlobalScope;

const ICON = "/icons/rimebook-192.png";
const TODAY = "/today";

/** The message the server sent, or words of our own when it cannot be read (a push must always show something). */
function readReminder(data: PushMessageData | null): ReminderMessage {
  const fallback: ReminderMessage = { title: "Rimebook", body: "Bags are due for a check today.", url: TODAY, tag: "rimebook-round" };
  try {
    const m = data?.json() as Partial<ReminderMessage> | undefined;
    if (!m || typeof m.title !== "string" || typeof m.body !== "string") return fallback;
    const url = typeof m.url === "string" && m.url.startsWith("/") && !m.url.startsWith("//") ? m.url : TODAY;
    return { title: m.title, body: m.body, url, tag: typeof m.tag === "string" ? m.tag : fallback.tag };
  } catch {
    return fallback;
  }
}

/** `push`: show the reminder. */
export function showReminder(event: PushEvent): void {
  const m = readReminder(event.data);
  event.waitUntil(
    self.registration.showNotification(m.title, {
      body: m.body,
      icon: ICON,
      tag: m.tag,
      data: { url: m.url },
      lang: "en",
    }),
  );
}

/** `notificationclick`: open Today, focusing a window of the app that is already open. */
export function openReminder(event: NotificationEvent): void {
  event.notification.close();
  const raw = (event.notification.data as { url?: unknown } | null)?.url;
  const target = new URL(typeof raw === "string" && raw.startsWith("/") && !raw.startsWith("//") ? raw : TODAY, self.location.origin).href;
  event.waitUntil(
    (async () => {
      const windows = await self.clients.matchAll({ type: "window", includeUncontrolled: true });
      const open = windows.find((w) => new URL(w.url).origin === self.location.origin);
      if (open) {
        // Today in the window already open (navigate needs no user gesture; focus brings it to the front).
        const shown = new URL(open.url).pathname === new URL(target).pathname ? open : ((await open.navigate(target).catch(() => null)) ?? null);
        if (shown) {
          await shown.focus().catch(() => undefined);
          return;
        }
      }
      await self.clients.openWindow(target);
    })(),
  );
}

/** Wires both handlers (called once from sw/index.ts). */
export function listenForReminders(): void {
  self.addEventListener("push", showReminder);
  self.addEventListener("notificationclick", openReminder);
}
