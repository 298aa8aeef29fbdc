import { buildBagRows, type BagRow, type WindowClock } from "@/lib/domain/rows/bag-rows";
import type { IsoDay } from "@/lib/domain/dates";
import type { PullWindow } from "@/lib/domain/schedule";
import type { BagForSheet } from "@/lib/client/fridge-reads";
// The sheet reads its bag through this chunk too: fridge-reads carries the kept readings and the round's row code.
export { loadBagForSheet } from "@/lib/client/fridge-reads";
import { pickBagCautions, type BagCaution } from "./bag-cautions";
import type { BagForCheck } from "./check-draft";

// What the check sheet's header shows about one bag, worked out with the same helpers as the bags table.

export interface SheetView {
  row: BagRow;
  forCheck: BagForCheck;
  cautions: BagCaution[];
  /** "Hollow Lane roadside collection, 2025" */
  lotText: string;
}

export function describeSheet(data: BagForSheet, today: IsoDay, clock?: WindowClock): SheetView | null {
  const { bag, lot, protocol, store } = data;
  const row = buildBagRows(
    { bags: [bag], lots: lot ? [lot] : [], protocols: protocol ? [protocol] : [], stores: store ? [store] : [], readings: data.readings },
    today,
    clock,
  )[0];
  if (!row) return null;
  return {
    row,
    forCheck: {
      id: bag.id,
      storeId: bag.store_id ?? null,
      startedOn: row.startedOn,
      state: row.state,
      window: row.window,
      nextMoveOn: row.nextMoveOn,
      checkEveryDays: row.checkEveryDays,
    },
    cautions: pickBagCautions({
      species: row.species,
      toxicSeed: protocol?.toxic_seed ?? null,
      medicinal: Boolean(protocol?.medicinal),
      treated: Boolean(lot?.treated),
      storeHoldsFood: Boolean(store?.holds_food),
    }),
    lotText: [lot?.source, lot?.year].filter((v) => v !== null && v !== undefined && v !== "").join(", "),
  };
}

/** "10 Dec – 24 Dec", "22 Feb" when the sources agree on one day, "from 3 Jan, when roots show" with no latest date. */
export function formatPullWindow(w: PullWindow | null, formatDay: (d: IsoDay) => string): string {
  if (!w) return "No window (no protocol)";
  if (w.closesOn === null) return `From ${formatDay(w.opensOn)}, when roots show`;
  if (w.closesOn === w.opensOn) return formatDay(w.opensOn);
  return `${formatDay(w.opensOn)} – ${formatDay(w.closesOn)}`;
}
