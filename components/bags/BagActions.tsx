"use client";

import Link from "next/link";
import { useState } from "react";
import type { Bag } from "@/lib/schemas/bag";
import type { Store } from "@/lib/schemas/store";
import type { BagState } from "@/lib/schemas/vocabulary";
import { discardBag, pullBag } from "@/lib/client/repo";
import { Button, buttonClass } from "@/components/ui/Button";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { Field, Input, TextArea } from "@/components/ui/Field";
import { BagEditForm } from "./BagEditForm";
import { describeSaveError } from "./save-error";
import { SaveError } from "./FormBits";

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
  const [day, setDay] = useState(today);
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const open = (p: Panel) => {
    setError(null);
    setDay(today);
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
          <Button tone="good" aria-expanded={panel === "pull"} onClick={() => open("pull")}>
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
          <Button tone="quiet" aria-expanded={panel === "discard"} onClick={() => open("discard")} className="text-ember-700">
            Discard
          </Button>
        ) : null}
      </div>

      {panel === "pull" ? (
        <section aria-label="Pull the bag" className="space-y-3 rounded-card border-2 border-moss-600 bg-moss-100 p-3">
          <p className="text-body">Take the bag out of the cold. Sow soon: sprouted roots break easily.</p>
          <Field label="Pulled on" htmlFor="pull-day">
            <Input id="pull-day" type="date" value={day} max={today} min={bag.start_date ?? undefined} onChange={(e) => setDay(e.target.value)} />
          </Field>
          <Button tone="good" size="lg" className="w-full" disabled={busy || !day} onClick={() => run(() => pullBag(bag.id, day))}>
            Save the pull
          </Button>
        </section>
      ) : null}

      {panel === "discard" ? (
        <section aria-label="Discard the bag" className="space-y-3 rounded-card border-2 border-ember-600 bg-white p-3">
          <Caution title="If there is mould" tone="strong">
            {cautionTexts.mould}
          </Caution>
          <Field label="Why is it discarded? (optional)" htmlFor="discard-reason" hint="For example: mould spreading, dried out, seed rotted.">
            <TextArea id="discard-reason" value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} />
          </Field>
          <Field label="Discarded on" htmlFor="discard-day">
            <Input id="discard-day" type="date" value={day} max={today} onChange={(e) => setDay(e.target.value)} />
          </Field>
          <Button tone="danger" size="lg" className="w-full" disabled={busy || !day} onClick={() => run(() => discardBag(bag.id, day, reason.trim() || null))}>
            Discard this bag
          </Button>
        </section>
      ) : null}

      {panel === "edit" ? (
        <section aria-label="Edit the bag" className="rounded-card border-2 border-glacier-600 bg-white p-3">
          <BagEditForm bag={bag} stores={stores} onDone={() => setPanel(null)} />
        </section>
      ) : null}

      <SaveError message={error} />
    </div>
  );
}
