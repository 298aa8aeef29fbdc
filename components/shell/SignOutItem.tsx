"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { signOut } from "@/lib/client/identity";
import type { WaitingTally } from "@/lib/client/waiting";
import { unsentWords } from "./sync-words";

// "Sign out of this phone", at the end of the Farm menu and of the desktop side column. Work still only on
// this phone is named before anything is deleted.
export function SignOutItem({ className = "px-4 py-3" }: { className?: string }) {
  const router = useRouter();
  const [warning, setWarning] = useState<WaitingTally | null>(null);
  const [busy, setBusy] = useState(false);
  const go = async (force: boolean) => {
    setBusy(true);
    const result = await signOut({ force });
    setBusy(false);
    if (result.ok) router.replace("/sign-in");
    else setWarning(result.waiting);
  };
  return (
    <li className={className}>
      {warning ? (
        <div role="alert" className="space-y-2">
          <p className="text-label">
            <strong className="text-ember-700">Not everything is sent yet.</strong> {unsentWords(warning)} only on this phone. Signing out now deletes{" "}
            {warning.records + warning.photos === 1 ? "it" : "them"}. Find signal and wait for &ldquo;Synced&rdquo; first if you can.
          </p>
          <div className="flex gap-2">
            <button type="button" onClick={() => setWarning(null)} className="min-h-tap rounded-card bg-glacier-700 px-4 font-semibold text-white">
              Stay signed in
            </button>
            <button type="button" disabled={busy} onClick={() => void go(true)} className="min-h-tap rounded-card px-3 font-semibold text-ember-700">
              Sign out anyway
            </button>
          </div>
        </div>
      ) : (
        <button type="button" disabled={busy} onClick={() => void go(false)} className="min-h-tap w-full text-left font-semibold text-ember-700">
          Sign out of this phone
        </button>
      )}
    </li>
  );
}
