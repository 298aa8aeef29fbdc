"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { deleteStore } from "@/lib/client/repo";
import { findBagsStillInStore, type BagPlace } from "@/lib/domain/store-rules";
import { formatBagCode } from "@/lib/domain/bag-codes";
import type { Store } from "@/lib/schemas/store";
import { Button } from "@/components/ui/Button";
import { ConfirmPanel, useConfirmedAction } from "@/components/ui/ConfirmPanel";
import { describeSaveError } from "@/components/bags/save-error";
import { Notice } from "@/components/season/Notice";
import { describeStoreDelete, explainStoreRefusal } from "./store-delete";

/** Delete a cold store: refused while bags are still in it (each one linked, to move it), else confirmed first. */
export function StoreDelete({ store, bagsOfStore, readingCount }: { store: Store; bagsOfStore: readonly (BagPlace & { id: string })[]; readingCount: number }) {
  const router = useRouter();
  const del = useConfirmedAction(() => deleteStore(store.id), () => router.replace("/stores"), describeSaveError);
  const refusal = explainStoreRefusal(store, bagsOfStore);
  const held = findBagsStillInStore(bagsOfStore);

  if (!del.open) {
    return (
      <Button tone="danger-outline" className="w-full" onClick={del.show}>
        Delete this store…
      </Button>
    );
  }
  if (refusal) {
    return (
      <section aria-labelledby="store-delete-refused" className="space-y-3 rounded-card border-2 border-wheat-600 bg-wheat-100 p-4">
        <h3 id="store-delete-refused" className="text-body font-bold text-ink">
          {store.name} cannot be deleted yet
        </h3>
        <p role="alert" className="text-label text-ink">
          {refusal}
        </p>
        <ul className="grid grid-cols-2 gap-2">
          {held.map((b) => (
            <li key={b.id}>
              <Link
                href={`/bags/view?id=${encodeURIComponent(b.id)}`}
                className="flex min-h-tap items-center justify-center rounded-xl border-2 border-glacier-700 bg-paper px-2 font-mono font-bold tracking-wider text-glacier-800"
              >
                <span className="sr-only">Open bag </span>
                {formatBagCode(b.code)}
              </Link>
            </li>
          ))}
        </ul>
        <Button tone="quiet" className="w-full" onClick={del.cancel}>
          Close
        </Button>
      </section>
    );
  }
  return (
    <div className="space-y-2">
      <ConfirmPanel
        title={`Delete ${store.name}?`}
        confirmLabel={del.busy ? "Deleting…" : `Yes, delete ${store.name}`}
        busy={del.busy}
        onConfirm={del.run}
        onCancel={del.cancel}
      >
        {describeStoreDelete(readingCount).map((line) => (
          <p key={line}>{line}</p>
        ))}
      </ConfirmPanel>
      <Notice>{del.error}</Notice>
    </div>
  );
}
