import { describe, expect, it } from "vitest";
import { isAcceptedEndpoint } from "@/lib/server/push";

// The server POSTs to whatever endpoint a phone hands it, so only the browsers' own push services are accepted
// (https, default port); the local fake on loopback only when PUSH_ALLOW_LOOPBACK is on (it is off here).
// Hosts as the browsers' push subscriptions name them: from memory of the vendors' documentation, not checked here.

describe("push endpoints the server will send to", () => {
  it.each([
    "https://fcm.googleapis.com/fcm/send/abc:def",
    "https://updates.push.services.mozilla.com/wpush/v2/gAAAA",
    "https://wns2-db5p.notify.windows.com/w/?token=BQYAAA",
    "https://web.push.apple.com/QGx2ZQ",
  ])("accepts %s", (url) => expect(isAcceptedEndpoint(url)).toBe(true));

  it.each([
    "http://fcm.googleapis.com/fcm/send/abc", // not https
    "https://fcm.googleapis.com:8443/fcm/send/abc", // another port
    "https://fcm.googleapis.com.evil.example/fcm/send/abc", // look-alike host
    "https://user:pw@fcm.googleapis.com/fcm/send/abc",
    "https://169.254.169.254/latest/meta-data",
    "http://127.0.0.1:5432/push/1", // loopback while not allowed
    "not a url",
  ])("refuses %s", (url) => expect(isAcceptedEndpoint(url)).toBe(false));
});
