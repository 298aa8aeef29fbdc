"use client";

import { useState } from "react";
import { useRouter } from "next/navigation";
import { deleteTrial } from "@/lib/client/repo";
import type { Trial } from "@/lib/schemas/trial";
import { Button } from "@/components/ui/Button";
import { ConfirmPanel } from "@/components/ui/ConfirmPanel";
import { describeSaveError } from "@/components/bags/save-error";
import { Notice } from "@/components/season/Notice";
import { describeTrialDelete } from "./trial-manage";

export function TrialDelete({ trial, armLabels, bagsInArms, hasOwnProtocol }: { trial: Trial; armLabels: readonly string[]; bagsInArms: number; hasOwnProtocol: boolean }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function remove() {
    setBusy(true);
    setError(null);
    try {
      await deleteTrial(trial.id);
      router.replace("/trials");
    } catch (e) {
      setError(describeSaveError(e));
      setBusy(false);
    }
  }

  if (!open) {
    return (
      <Button tone="quiet" className="w-full text-ember-700" onClick={() => setOpen(true)}>
        Delete this trial…
      </Button>
    );
  }
  return (
    <div className="space-y-2">
      <ConfirmPanel
        title={`Delete the trial “${trial.name}”?`}
        confirmLabel={busy ? "Deleting…" : "Yes, delete the trial"}
        cancelLabel="Keep the trial"
        busy={busy}
        onConfirm={() => void remove()}
        onCancel={() => {
          setOpen(false);
          setError(null);
        }}
      >
        {describeTrialDelete({ armLabels, bagsInArms, hasOwnProtocol }).map((line) => (
          <p key={line}>{line}</p>
        ))}
      </ConfirmPanel>
      <Notice>{error}</Notice>
    </div>
  );
}
