"use client";

import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Caution, cautionTexts } from "@/components/ui/Caution";
import { Field, Input, TextArea } from "@/components/ui/Field";

// Pulling and discarding a bag are steps of their own, each confirmed with its date (the bag page and the
// check sheet use the same two panels).

export function PullPanel({
  today,
  startedOn,
  busy,
  onConfirm,
  onCancel,
}: {
  today: string;
  startedOn: string | null;
  busy: boolean;
  onConfirm: (day: string) => void;
  onCancel?: () => void;
}) {
  const [day, setDay] = useState(today);
  return (
    <section aria-label="Pull the bag" className="space-y-3 rounded-card border-2 border-moss-600 bg-moss-100 p-3">
      <p className="text-body">Take the bag out of the cold. Sow soon: sprouted roots break easily.</p>
      <Field label="Pulled on" htmlFor="pull-day">
        <Input id="pull-day" type="date" value={day} max={today} min={startedOn ?? undefined} onChange={(e) => setDay(e.target.value)} />
      </Field>
      <div className="flex gap-2">
        <Button tone="good" size="lg" className="flex-1" disabled={busy || !day} onClick={() => onConfirm(day)}>
          Save the pull
        </Button>
        {onCancel ? (
          <Button tone="quiet" size="lg" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </section>
  );
}

export function DiscardPanel({
  today,
  busy,
  defaultReason = "",
  onConfirm,
  onCancel,
}: {
  today: string;
  busy: boolean;
  defaultReason?: string;
  onConfirm: (day: string, reason: string | null) => void;
  onCancel?: () => void;
}) {
  const [day, setDay] = useState(today);
  const [reason, setReason] = useState(defaultReason);
  return (
    <section aria-label="Discard the bag" className="space-y-3 rounded-card border-2 border-ember-600 bg-paper p-3">
      <Caution title="If there is mould" tone="strong">
        {cautionTexts.mould}
      </Caution>
      <Field label="Why is it discarded? (optional)" htmlFor="discard-reason" hint="For example: mould spreading, dried out, seed rotted.">
        <TextArea id="discard-reason" value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} />
      </Field>
      <Field label="Discarded on" htmlFor="discard-day">
        <Input id="discard-day" type="date" value={day} max={today} onChange={(e) => setDay(e.target.value)} />
      </Field>
      <div className="flex gap-2">
        <Button tone="danger" size="lg" className="flex-1" disabled={busy || !day} onClick={() => onConfirm(day, reason.trim() || null)}>
          Discard this bag
        </Button>
        {onCancel ? (
          <Button tone="quiet" size="lg" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </section>
  );
}
