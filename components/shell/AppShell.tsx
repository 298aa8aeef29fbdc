"use client";

import Link from "next/link";
import { useEffect, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { useIdentity, useSyncStatus } from "@/lib/client/hooks";
import { loadIdentity, refreshIdentity } from "@/lib/client/identity";
import { META } from "@/lib/client/meta";
import { startSyncLoop } from "@/lib/client/sync-signal";
import { RimeMark } from "@/components/ui/RimeMark";
import { BottomNav } from "./BottomNav";
import { SideNav } from "./SideNav";
import { SyncPill } from "./SyncPill";

// The signed-in frame around every farm screen. Who is signed in comes from the phone store, so the
// app opens with no signal; with signal, the server is asked first (a different person signing in
// on this phone must not send the previous person's waiting work under their name).

type Gate = "checking" | "ready" | "signed_out" | "needs_signal";

function withTimeout<T>(p: Promise<T>, ms: number, fallback: T): Promise<T> {
  return Promise.race([p, new Promise<T>((resolve) => setTimeout(() => resolve(fallback), ms))]);
}

export function AppShell({ children }: { children: React.ReactNode }) {
  const [gate, setGate] = useState<Gate>("checking");
  const identity = useIdentity();

  useEffect(() => {
    let cancelled = false;
    void (async () => {
      const local = await loadIdentity();
      const fresh = navigator.onLine ? await withTimeout(refreshIdentity(), 4000, "offline" as const) : "offline";
      if (cancelled) return;
      if (fresh === null && !local) {
        setGate("signed_out");
        window.location.replace(`/sign-in?next=${encodeURIComponent(window.location.pathname + window.location.search)}`);
        return;
      }
      if (fresh === "offline" && !local) return setGate("needs_signal");
      setGate("ready");
      void startSyncLoop(); // loaded now, after first paint; a 401 (fresh === null with a local identity) shows "needs sign-in"; the outbox is kept
    })();
    return () => {
      cancelled = true;
    };
  }, []);

  return (
    <div className="min-h-dvh pb-24 lg:pb-8">
      <header className="no-print sticky top-0 z-30 border-b border-rime-200 bg-rime-50/95 backdrop-blur">
        <div className="mx-auto flex max-w-xl items-center justify-between gap-3 px-4 py-2 lg:max-w-none">
          <Link href="/today" className="flex min-h-tap min-w-0 items-center gap-2">
            <RimeMark className="h-8 w-8 shrink-0" />
            <span className="line-clamp-2 text-label font-semibold leading-tight text-glacier-800 sm:text-body">{identity?.farm.name ?? "Rimebook"}</span>
            <span className="sr-only">: today&apos;s round</span>
          </Link>
          <SyncPill />
        </div>
      </header>
      <SideNav />
      {/* The one <main> of every farm screen; the screens inside are plain sections of it. */}
      <main id="main" className="lg:pl-60">
        {gate === "ready" && <FirstPull />}
        {gate === "needs_signal" ? <NeedsSignal /> : gate === "signed_out" ? null : children}
      </main>
      <BottomNav />
    </div>
  );
}

/** A new phone loads the whole farm once; the bar shows how far it has got. */
function FirstPull() {
  const done = useLiveQuery(async () => (await getLocalDb().meta.get(META.firstPullDone))?.value === true, [], true);
  const status = useSyncStatus();
  if (done) return null;
  const fp = status.firstPull;
  const share = fp && fp.total > 0 ? Math.min(1, fp.loaded / fp.total) : 0;
  const offline = !status.online || status.phase === "offline";
  return (
    <div className="mx-auto max-w-xl px-4 pt-4" role="status" aria-live="polite">
      <div className="rounded-card border border-rime-200 bg-paper p-4">
        <p className="font-semibold">{offline ? "Waiting for signal to load your farm" : "Loading your farm onto this phone"}</p>
        <p className="mt-1 text-label text-ink-soft">
          {offline ? "The first time on a phone needs a connection. After that, Rimebook works without one." : "Once this is done, every screen works without signal."}
        </p>
        <div className="mt-3 h-3 overflow-hidden rounded-full bg-rime-100" role="progressbar" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(share * 100)} aria-label="Farm loaded">
          <div className="h-full rounded-full bg-glacier-500 transition-[width]" style={{ width: `${Math.max(4, share * 100)}%` }} />
        </div>
      </div>
    </div>
  );
}

function NeedsSignal() {
  return (
    <div className="mx-auto max-w-xl px-4 py-8">
      <h1 className="text-title font-semibold">Sign in needs signal once</h1>
      <p className="mt-2 text-ink-soft">
        This phone has not been signed in to a farm yet. Find a connection and sign in; after that, Rimebook opens and records checks without one.
      </p>
      <Link href="/sign-in" className="mt-4 inline-flex min-h-tap items-center rounded-card bg-glacier-700 px-5 font-semibold text-white">
        Sign in
      </Link>
    </div>
  );
}
