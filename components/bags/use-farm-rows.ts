"use client";

import { useEffect, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { loadReadingsOfBagStores } from "@/lib/client/fridge-reads";
import { formatIsoDay, type IsoDay } from "@/lib/domain/dates";
import type { BagRowSources } from "@/lib/domain/rows/bag-rows";

// Live reads of the phone store for the bag, lot and protocol screens. Writes never happen here.

/**
 * Bags, lots, protocols and stores as the phone holds them (tombstones left out); undefined while loading.
 * `withReadings`: also the readings of the stores holding bags, so each bag's window moves by the cold it lost (as on Today).
 */
export function useBagSources(withReadings = false): BagRowSources | undefined {
  return useLiveQuery(async () => {
    const db = getLocalDb();
    const [bags, lots, protocols, stores] = await Promise.all([db.bags.toArray(), db.lots.toArray(), db.protocols.toArray(), db.stores.toArray()]);
    const live = <T extends { deleted_at: string | null }>(rows: T[]) => rows.filter((r) => !r.deleted_at);
    const readings = withReadings ? await loadReadingsOfBagStores(db, bags, stores) : [];
    return { bags: live(bags), lots: live(lots), protocols: live(protocols), stores: live(stores), readings };
  }, [withReadings]);
}

/** Today on the phone's calendar; refreshed when the phone wakes after midnight. */
export function useToday(): IsoDay {
  const [today, setToday] = useState(() => formatIsoDay(new Date()));
  useEffect(() => {
    const refresh = () => setToday(formatIsoDay(new Date()));
    const timer = window.setInterval(refresh, 60_000);
    document.addEventListener("visibilitychange", refresh);
    return () => {
      window.clearInterval(timer);
      document.removeEventListener("visibilitychange", refresh);
    };
  }, []);
  return today;
}
