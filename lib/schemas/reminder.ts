import { z } from "zod";

// Reminders on the phone (Web Push): what the Settings screen sends, what the server keeps per member and
// phone, and the message the service worker shows. One schema each, shared by the phone, the routes and the worker.

export const DeviceId = z.string({ error: "This phone's id is missing." }).min(1).max(64);

/** The browser's PushSubscription as `toJSON()` gives it (RFC 8030 endpoint, RFC 8291 keys). */
export const PushSubscriptionJson = z.object({
  endpoint: z.url({ error: "The phone's push address is not a web address." }).max(2000),
  expirationTime: z.number().nullable().optional(),
  keys: z.object({
    // An uncompressed P-256 point (65 bytes) and a 16-byte secret, URL-safe base64.
    p256dh: z.string().regex(/^[A-Za-z0-9_-]{86,88}={0,2}$/, { error: "The phone's push key is not valid." }),
    auth: z.string().regex(/^[A-Za-z0-9_-]{22,24}={0,2}$/, { error: "The phone's push secret is not valid." }),
  }),
});
export type PushSubscriptionJson = z.infer<typeof PushSubscriptionJson>;

/** ISO weekdays, Monday 1 … Sunday 7. */
export const Weekday = z.number().int().min(1).max(7);
export const everyDay = [1, 2, 3, 4, 5, 6, 7] as const;

export const ReminderTime = z.object({
  hour: z.number({ error: "Choose an hour." }).int().min(0, { error: "Choose an hour from 0 to 23." }).max(23, { error: "Choose an hour from 0 to 23." }),
  days: z
    .array(Weekday)
    .min(1, { error: "Choose at least one day." })
    .max(7)
    .transform((d) => [...new Set(d)].sort()),
});
export type ReminderTime = z.infer<typeof ReminderTime>;

/** PUT /api/reminders: remind me on this phone (or change the hour and days). */
export const ReminderSubscribeInput = ReminderTime.extend({ deviceId: DeviceId, subscription: PushSubscriptionJson });
export type ReminderSubscribeInput = z.infer<typeof ReminderSubscribeInput>;

/** DELETE /api/reminders, POST /api/reminders/test, and the phone's id at sign-out. */
export const ReminderDeviceInput = z.object({ deviceId: DeviceId });

/** GET /api/reminders?deviceId=… */
export const ReminderStateQuery = z.object({ deviceId: DeviceId });

/** What GET /api/reminders answers. */
export type ReminderState = {
  /** False when the server has no VAPID keys: reminders are off for everyone. */
  available: boolean;
  publicKey: string | null;
  timezone: string;
  /** This phone's reminder on this farm, if any. */
  here: (ReminderTime & { endpoint: string }) | null;
  /** The person's reminder time on this farm from another phone (used as the suggestion). */
  elsewhere: ReminderTime | null;
};

/** The encrypted message body the service worker reads. Only counts, store names and bag codes. */
export const ReminderMessage = z.object({
  title: z.string().max(120),
  body: z.string().max(600),
  url: z.string().startsWith("/").max(200),
  tag: z.string().max(80),
});
export type ReminderMessage = z.infer<typeof ReminderMessage>;
