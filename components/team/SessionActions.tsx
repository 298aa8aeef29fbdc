"use client";

import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { FormMessage, sendJson } from "@/components/auth/form-kit";
import { getLocalDb } from "@/lib/client/db";
import { deviceIdOf } from "@/lib/client/meta";
import { dropPushSubscription } from "@/lib/client/reminders";

/** Sign out here, or on every phone and computer (a lost phone, a shared tablet). */
export function SessionActions() {
  const [busy, setBusy] = useState<null | "here" | "everywhere">(null);
  const [confirming, setConfirming] = useState(false);
  const [message, setMessage] = useState<string | null>(null);

  async function signOut(where: "here" | "everywhere") {
    setBusy(where);
    setMessage(null);
    // Signing out here also stops this phone's reminders (the server drops them by the phone's id).
    const deviceId = await deviceIdOf(getLocalDb());
    const res = await sendJson(where === "here" ? "/api/auth/sign-out" : "/api/auth/sign-out-everywhere", where === "here" ? { deviceId } : {});
    if (res.ok || res.status === 401) await dropPushSubscription();
    setBusy(null);
    if (!res.ok && res.status !== 401) {
      setMessage(res.error.message);
      return;
    }
    window.location.assign("/sign-in");
  }

  return (
    <div className="space-y-3">
      <p className="text-label text-ink-soft">
        Signing out keeps any checks this phone has not sent yet on the phone; they go up after you sign in again.
      </p>
      <div className="flex flex-col gap-2 sm:flex-row">
        <Button tone="secondary" onClick={() => signOut("here")} disabled={busy !== null}>
          {busy === "here" ? "Signing out…" : "Sign out on this phone"}
        </Button>
        {confirming ? (
          <Button tone="danger" onClick={() => signOut("everywhere")} disabled={busy !== null}>
            {busy === "everywhere" ? "Signing out…" : "Yes, sign out everywhere"}
          </Button>
        ) : (
          <Button tone="quiet" onClick={() => setConfirming(true)} disabled={busy !== null}>
            Sign out everywhere…
          </Button>
        )}
      </div>
      <FormMessage message={message} />
    </div>
  );
}
