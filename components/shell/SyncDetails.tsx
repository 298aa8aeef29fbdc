"use client";

import Link from "next/link";
import { useEffect, useRef, useState } from "react";
import { useIdentity, usePendingPhotos, useRejectedMutations, type SyncStatus } from "@/lib/client/hooks";
import { canRetryAs, dismissRejected, getSyncEngine, retryRejected } from "@/lib/client/sync";
import { discardPendingPhoto, retryPendingPhoto } from "@/lib/client/photos";
import type { MutationName } from "@/lib/schemas/mutations";
import { clockTime, mutationWords, waitingCount, waitingWords } from "./sync-words";

const phaseWords: Record<SyncStatus["phase"], string> = {
  idle: "Up to date with the farm.",
  syncing: "Sending and fetching changes…",
  offline: "No signal. Everything you record stays on this phone and is sent when the signal returns.",
  needs_sign_in: "Your sign-in has ended. Nothing waiting is lost: sign in again and it will be sent.",
  error: "The last try did not work. Rimebook will try again by itself.",
};

function when(iso: string): string {
  const d = new Date(iso);
  return `${d.toLocaleDateString(undefined, { day: "numeric", month: "short" })} ${clockTime(iso)}`;
}

/** Sync details: state, what waits, and every change the server refused (with retry / let go). */
export function SyncDetails({ status, onClose }: { status: SyncStatus; onClose: () => void }) {
  const rejected = useRejectedMutations();
  const photos = usePendingPhotos();
  const identity = useIdentity();
  const [retryRefusal, setRetryRefusal] = useState<{ id: string; message: string } | null>(null);
  const closeRef = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    closeRef.current?.focus();
    const onKey = (e: KeyboardEvent) => e.key === "Escape" && onClose();
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [onClose]);
  const refusedPhotos = photos.filter((p) => p.error);

  return (
    <div className="fixed inset-0 z-50 flex items-end justify-center bg-ink/40 sm:items-center" onClick={onClose}>
      <section
        role="dialog"
        aria-modal="true"
        aria-labelledby="sync-details-title"
        className="max-h-[85dvh] w-full max-w-lg overflow-y-auto rounded-t-card bg-paper p-5 shadow-xl sm:rounded-card"
        onClick={(e) => e.stopPropagation()}
      >
        <div className="flex items-start justify-between gap-3">
          <h2 id="sync-details-title" className="text-title font-semibold">
            Sync
          </h2>
          <button ref={closeRef} type="button" onClick={onClose} className="min-h-tap rounded-card px-3 font-semibold text-glacier-700">
            Close
          </button>
        </div>
        <p className="mt-2 text-ink-soft">{status.online ? phaseWords[status.phase] : phaseWords.offline}</p>
        {/* Only a failure has words of its own; offline and sign-in are already said once above. */}
        {status.error && status.phase === "error" && <p className="mt-2 text-label text-ember-700">{status.error}</p>}
        <p className="mt-4" data-testid="sync-waiting">
          {status.waiting.records + status.waiting.photos > 0 ? (
            <>
              <strong>{waitingCount(status.waiting)}</strong> on this phone: {waitingWords(status.waiting)}.
            </>
          ) : (
            "Nothing waiting on this phone."
          )}
        </p>
        <dl className="mt-3 grid grid-cols-2 gap-x-4 gap-y-2 text-label">
          <dt className="text-ink-soft">Last synced</dt>
          <dd className="font-semibold">{status.lastSyncAt ? when(status.lastSyncAt) : "Not yet"}</dd>
          {status.retryAt && (
            <>
              <dt className="text-ink-soft">Next try</dt>
              <dd className="font-semibold">{clockTime(new Date(status.retryAt).toISOString())}</dd>
            </>
          )}
        </dl>
        <div className="mt-4 flex flex-wrap gap-3">
          {status.phase === "needs_sign_in" ? (
            <Link href={`/sign-in?next=${encodeURIComponent(typeof window === "undefined" ? "/today" : window.location.pathname)}`} className="flex min-h-tap items-center rounded-card bg-glacier-700 px-4 font-semibold text-white">
              Sign in again
            </Link>
          ) : (
            <button type="button" onClick={() => void getSyncEngine().syncNow()} className="min-h-tap rounded-card bg-glacier-700 px-4 font-semibold text-white">
              Sync now
            </button>
          )}
        </div>

        {(rejected.length > 0 || refusedPhotos.length > 0) && (
          <div className="mt-6">
            <h3 className="font-semibold text-ember-700">Not saved on the farm</h3>
            <p className="mt-1 text-label text-ink-soft">
              The server refused these. They are kept here until you decide: try again (for example after your role was changed) or let them go.
            </p>
            <ul className="mt-3 space-y-3" data-testid="rejected-list">
              {rejected.map((entry) => (
                <li key={entry.id} className="rounded-card border border-ember-600/30 bg-ember-100/50 p-3">
                  <div className="flex justify-between gap-2 text-label">
                    <strong>{mutationWords[entry.name as MutationName] ?? entry.name}</strong>
                    <span className="text-ink-soft">{when(entry.at)}</span>
                  </div>
                  <p className="mt-1 text-label">{entry.error?.message}</p>
                  {entry.error && "fields" in entry.error && entry.error.fields ? (
                    <ul className="mt-1 list-disc pl-5 text-label text-ink-soft">
                      {Object.entries(entry.error.fields as Record<string, string>).map(([k, v]) => (
                        <li key={k}>{v}</li>
                      ))}
                    </ul>
                  ) : null}
                  {retryRefusal?.id === entry.id ? <p className="mt-1 text-label font-semibold text-ember-700">{retryRefusal.message}</p> : null}
                  <div className="mt-2 flex gap-2">
                    {/* Another person's (or farm's) work is never sent under whoever is signed in now. */}
                    {canRetryAs(entry, identity) ? (
                      <button
                        type="button"
                        onClick={() => void retryRejected(entry.id).then((r) => setRetryRefusal(r.ok ? null : { id: entry.id, message: r.message }))}
                        className="min-h-tap rounded-card border-2 border-glacier-700 px-3 text-label font-semibold text-glacier-700"
                      >
                        Try again
                      </button>
                    ) : null}
                    <button
                      type="button"
                      onClick={() => {
                        if (window.confirm("Let this change go? It was never saved on the farm and will be gone from this phone.")) void dismissRejected(entry.id);
                      }}
                      className="min-h-tap rounded-card px-3 text-label font-semibold text-ember-700"
                    >
                      Let it go
                    </button>
                  </div>
                </li>
              ))}
              {refusedPhotos.map((p) => (
                <li key={p.id} className="rounded-card border border-ember-600/30 bg-ember-100/50 p-3">
                  <strong className="text-label">Photo</strong>
                  <p className="mt-1 text-label">{p.error}</p>
                  <div className="mt-2 flex gap-2">
                    <button type="button" onClick={() => void retryPendingPhoto(p.id)} className="min-h-tap rounded-card border-2 border-glacier-700 px-3 text-label font-semibold text-glacier-700">
                      Try again
                    </button>
                    <button type="button" onClick={() => window.confirm("Remove this photo from the phone?") && void discardPendingPhoto(p.id)} className="min-h-tap rounded-card px-3 text-label font-semibold text-ember-700">
                      Let it go
                    </button>
                  </div>
                </li>
              ))}
            </ul>
          </div>
        )}
      </section>
    </div>
  );
}
