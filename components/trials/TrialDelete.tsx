"use client";

import { useRouter } from "next/navigation";
import { deleteTrial } from "@/lib/client/repo";
import type { Trial } from "@/lib/schemas/trial";
import { Button } from "@/components/ui/Button";
import { ConfirmPanel, useConfirmedAction } from "@/components/ui/ConfirmPanel";
import { describeSaveError } from "@/components/bags/save-error";
import { Notice } from "@/components/season/Notice";
import { describeTrialDelete } from "./trial-manage";

export function TrialDelete({ trial, armLabels, bagsInArms, hasOwnProtocol }: { trial: Trial; armLabels: readonly string[]; bagsInArms: number; hasOwnProtocol: boolean }) {
  const router = useRouter();
  const del = useConfirmedAction(() => deleteTrial(trial.id), () => router.replace("/trials"), describeSaveError);

  if (!del.open) {
    return (
      <Button tone="danger-outline" className="w-full" onClick={del.show}>
        Delete this trial…
      </Button>
    );
  }
  return (
    <div className="space-y-2">
      <ConfirmPanel
        title={`Delete the trial “${trial.name}”?`}
        confirmLabel={del.busy ? "Deleting…" : "Yes, delete the trial"}
        cancelLabel="Keep the trial"
        busy={del.busy}
        onConfirm={del.run}
        onCancel={del.cancel}
      >
        {describeTrialDelete({ armLabels, bagsInArms, hasOwnProtocol }).map((line) => (
          <p key={line}>{line}</p>
        ))}
      </ConfirmPanel>
      <Notice>{del.error}</Notice>
    </div>
  );
}
