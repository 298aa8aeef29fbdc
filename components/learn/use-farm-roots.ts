"use client";

import { useLiveQuery } from "dexie-react-hooks";
import { lazyModule, useLazyModule } from "@/lib/client/lazy-module";
import type { IsoDay } from "@/lib/domain/dates";

// The history's computations are not needed for a screen's first paint: fetched beside hydration.
const farmRoots = lazyModule(() => import("./farm-roots-data"));

/**
 * The farm's own roots history for one bag's species: one line for the bag page and check sheet, and the day the
 * bag turns daily (the same rule Today uses). Undefined while reading the phone store.
 */
export function useFarmRoots(species: string | null | undefined, startedOn: IsoDay | null): { line: string | null; watchFrom: IsoDay | null } | undefined {
  const data = useLazyModule(farmRoots);
  return useLiveQuery(async () => {
    if (!species) return { line: null, watchFrom: null };
    return data?.readFarmRoots(species, startedOn);
  }, [species, startedOn, data]);
}
