"use client";

import Link from "next/link";
import { useEffect, useState } from "react";
import { useRouter } from "next/navigation";
import Dexie from "dexie";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { formatTemperature } from "@/lib/domain/units";
import { isOutsideStoreBand } from "@/lib/domain/store-rules";
import { vocabularyLabels } from "@/lib/schemas/words";
import { Button } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { useMember } from "@/components/season/use-member";
import { StoreForm } from "./StoreForm";
import { StoreGlyph } from "./StoreGlyph";

export function StoresScreen() {
  const { can, unit } = useMember();
  const [adding, setAdding] = useState(false);
  const router = useRouter();
  // ?add=1 (a new farm's first steps) opens the form at once; saving it goes back to those steps.
  const [fromFirstSteps, setFromFirstSteps] = useState(false);
  useEffect(() => {
    if (new URLSearchParams(window.location.search).get("add") === "1") {
      setAdding(true);
      setFromFirstSteps(true);
    }
  }, []);
  const data = useLiveQuery(async () => {
    const db = getLocalDb();
    const stores = (await db.stores.toArray()).filter((s) => !s.deleted_at).sort((a, b) => a.name.localeCompare(b.name));
    const bags = await db.bags.toArray();
    const latest = await Promise.all(
      stores.map((s) => db.readings.where("[store_id+taken_at]").between([s.id, Dexie.minKey], [s.id, Dexie.maxKey]).last()),
    );
    return stores.map((s, i) => ({
      store: s,
      // Bags in the store now: started, not yet pulled or discarded.
      activeBags: bags.filter((b) => b.store_id === s.id && !b.deleted_at && b.start_date && !b.pulled_on && !b.discarded_on && !b.sown_on).length,
      latest: latest[i] ?? null,
    }));
  }, []);

  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 pb-28 pt-4">
      <PageHeader
        title="Cold stores"
        subtitle="Fridges, freezers and cold frames, with their readings."
        action={
          can("store.create") && !adding ? (
            <Button onClick={() => setAdding(true)} aria-expanded={adding}>
              Add
            </Button>
          ) : null
        }
      />
      {adding ? (
        <Card className="mb-4">
          <h2 className="mb-3 text-body font-bold text-glacier-800">New cold store</h2>
          <StoreForm
            onDone={(id) => {
              setAdding(false);
              if (fromFirstSteps && id) router.push("/today");
            }}
          />
        </Card>
      ) : null}
      {data === undefined ? <p className="text-ink-soft">Opening the farm on this phone…</p> : null}
      {data && data.length === 0 ? (
        <Card>
          <p>No cold stores yet. Add the fridge, freezer or cold frame your bags live in, with its boxes or shelves.</p>
        </Card>
      ) : null}
      <ul className="space-y-3">
        {data?.map(({ store, activeBags, latest }) => {
          const outside = latest ? isOutsideStoreBand(store.kind, latest.temperature_c) : false;
          return (
            <li key={store.id}>
              <Link href={`/stores/view?id=${store.id}`} className="block rounded-card border border-rime-200 bg-paper p-4 shadow-sm hover:border-glacier-500">
                <div className="flex items-start gap-3">
                  <StoreGlyph kind={store.kind} />
                  <div className="min-w-0 flex-1">
                    <p className="text-body font-bold text-ink">{store.name}</p>
                    <p className="text-label text-ink-soft">
                      {vocabularyLabels.storeKind[store.kind]} · {activeBags} bag{activeBags === 1 ? "" : "s"} chilling
                      {store.holds_food ? " · shared with food" : ""}
                    </p>
                    {store.boxes.length ? <p className="mt-1 truncate text-label text-ink-soft">{store.boxes.join(" · ")}</p> : null}
                  </div>
                  <div className="text-right">
                    {latest ? (
                      <>
                        <p className={`text-title font-bold ${outside ? "text-ember-700" : "text-glacier-800"}`}>
                          {formatTemperature(latest.temperature_c, unit)}
                        </p>
                        <p className="text-label text-ink-soft">{outside ? "outside the cold band" : "last reading"}</p>
                      </>
                    ) : (
                      <p className="text-label text-ink-soft">no readings</p>
                    )}
                  </div>
                </div>
              </Link>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
