"use client";

import dynamic from "next/dynamic";
import Link from "next/link";
import { useState } from "react";
import type { Bag } from "@/lib/schemas/bag";
import type { Store } from "@/lib/schemas/store";
import type { BagState } from "@/lib/schemas/words";
import { discardBag, pullBag } from "@/lib/client/repo";
import { Button, buttonClass } from "@/components/ui/Button";
import { DiscardPanel, PullPanel } from "./EndBagPanels";
import { describeSaveError } from "./save-error";
import { SaveError } from "./FormBits";

// Opened by a tap, so loaded then (react-hook-form and zod stay out of the first load; precached for offline).
const BagEditForm = dynamic(() => import("./BagEditForm").then((m) => m.BagEditForm), { ssr: false });

type Panel = "pull" | "discard" | "edit" | null;

const inTheCold = (s: BagState) => s === "chilling" || s === "window_open" || s === "overdue";

export interface BagPermissions {
  check: boolean;
  pull: boolean;
  discard: boolean;
  edit: boolean;
  sow: boolean;
}

/** What a member can do with the bag in front of them, by role (hidden, not just disabled, when the role cannot). */
export function BagActions({ bag, state, stores, today, can }: { bag: Bag; state: BagState; stores: readonly Store[]; today: string; can: BagPermissions }) {
  const [panel, setPanel] = useState<Panel>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const open = (p: Panel) => {
    setError(null);
    setPanel((cur) => (cur === p ? null : p));
  };
  const run = async (write: () => Promise<unknown>) => {
    setBusy(true);
    setError(null);
    try {
      await write();
      setPanel(null);
    } catch (e) {
      setError(describeSaveError(e));
    } finally {
      setBusy(false);
    }
  };

  const cold = inTheCold(state);
  const finished = state === "sown" || state === "discarded";
  // Once pulled, sowing is recorded in the panel further down the bag page.
  const anything = (can.check && cold) || (can.pull && cold) || (can.sow && cold) || (can.discard && !finished) || can.edit;
  if (!anything) {
    return <p className="text-label text-ink-soft">{finished ? "This bag is finished." : "Your role can read this bag but not change it."}</p>;
  }

  return (
    <div className="space-y-3">
      <div className="grid grid-cols-2 gap-2">
        {can.check && cold ? (
          <Link href={`/check?bag=${encodeURIComponent(bag.id)}`} className={`${buttonClass("primary", "lg")} col-span-2`}>
            Check now
          </Link>
        ) : null}
        {can.pull && cold ? (
          // Solid only once the window is open; before that pulling is possible but not the suggested step.
          <Button tone={state === "chilling" ? "secondary" : "good"} aria-expanded={panel === "pull"} onClick={() => open("pull")}>
            Pull
          </Button>
        ) : null}
        {can.sow && cold ? (
          <Link href={`/sowing?bag=${encodeURIComponent(bag.id)}`} className={buttonClass("secondary", "md")}>
            Record sowing
          </Link>
        ) : null}
        {can.edit ? (
          <Button tone="quiet" aria-expanded={panel === "edit"} onClick={() => open("edit")}>
            Edit
          </Button>
        ) : null}
        {can.discard && !finished ? (
          <Button tone="danger-outline" aria-expanded={panel === "discard"} onClick={() => open("discard")}>
            Discard
          </Button>
        ) : null}
      </div>

      {panel === "pull" ? <PullPanel today={today} startedOn={bag.start_date ?? null} busy={busy} onConfirm={(day) => run(() => pullBag(bag.id, day))} /> : null}

      {panel === "discard" ? (
        <DiscardPanel today={today} busy={busy} onConfirm={(day, reason) => run(() => discardBag(bag.id, day, reason))} />
      ) : null}

      {panel === "edit" ? (
        <section aria-label="Edit the bag" className="rounded-card border-2 border-glacier-600 bg-paper p-3">
          <BagEditForm bag={bag} stores={stores} onDone={() => setPanel(null)} />
        </section>
      ) : null}

      <SaveError message={error} />
    </div>
  );
}
