"use client";

import dynamic from "next/dynamic";
import { useState } from "react";
import { createPortal } from "react-dom";
import { useSyncStatus } from "@/lib/client/hooks";
import { describeSyncStatus, type PillTone } from "./sync-words";

// The details open only after a tap, so they load then (precached for offline like every chunk).
const SyncDetails = dynamic(() => import("./SyncDetails").then((m) => m.SyncDetails), { ssr: false });

const tones: Record<PillTone, string> = {
  ok: "bg-moss-100 text-moss-700 border-moss-600/30",
  calm: "bg-rime-100 text-ink-soft border-rime-300",
  waiting: "bg-wheat-100 text-wheat-700 border-wheat-600/30",
  alert: "bg-ember-100 text-ember-700 border-ember-600/40",
};

const dots: Record<PillTone, string> = { ok: "bg-moss-600", calm: "bg-rime-300", waiting: "bg-wheat-600", alert: "bg-ember-600" };

/** The sync state on every screen; tap for details (and refused changes). */
export function SyncPill() {
  const status = useSyncStatus();
  const [open, setOpen] = useState(false);
  const { text, tone } = describeSyncStatus(status);
  return (
    <>
      <button
        type="button"
        onClick={() => setOpen(true)}
        className={`inline-flex min-h-tap items-center gap-2 rounded-full border px-3 text-label font-semibold ${tones[tone]}`}
        aria-haspopup="dialog"
        aria-label={`Sync status: ${text}. Show details`}
        data-testid="sync-pill"
        data-phase={status.phase}
      >
        <span className={`h-2.5 w-2.5 rounded-full ${dots[tone]} ${status.phase === "syncing" ? "animate-pulse" : ""}`} aria-hidden="true" />
        <span className="whitespace-nowrap">{text}</span>
      </button>
      {/* Portalled: the sticky header's backdrop blur would otherwise trap a fixed dialog inside it. */}
      {open && createPortal(<SyncDetails status={status} onClose={() => setOpen(false)} />, document.body)}
    </>
  );
}
