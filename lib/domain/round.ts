import type { BagState } from "@/lib/schemas/words";
import type { IsoDay } from "./dates";
import {
  determineBagState,
  scheduleNextCheck,
  type BagRecord,
  type CheckCadence,
  type CheckFindings,
  type NextCheck,
  type NextCheckReason,
  type PullWindow,
} from "./schedule";

export interface RoundBag extends BagRecord {
  id: string;
  code: string;
  storeId: string;
  storeName: string;
  box: string;
  species?: string;
  window: PullWindow | null;
  lastCheck?: CheckFindings | null;
  nextMoveOn?: IsoDay | null;
  /** The bag's own days between checks before its window, when set. */
  checkEveryDays?: number | null;
  /** From this day the farm's history says roots may show (daily checks from then). */
  rootsWatchFrom?: IsoDay | null;
}

export interface RoundItem {
  bag: RoundBag;
  state: BagState;
  next: NextCheck;
  /** 0 is most urgent. */
  priority: number;
  /** The check fell due before today and was missed. */
  isLate: boolean;
}

export interface RoundBox {
  box: string;
  items: RoundItem[];
}

export interface RoundStore {
  storeId: string;
  storeName: string;
  boxes: RoundBox[];
  /** Most urgent priority in this store; stores are listed most urgent first. */
  topPriority: number;
}

export interface TodaysRound {
  date: IsoDay;
  /** Every due bag, most urgent first. */
  items: RoundItem[];
  /** The same bags, grouped by cold store and box for walking the fridges. */
  stores: RoundStore[];
  counts: { due: number; urgent: number; byReason: Partial<Record<NextCheckReason, number>> };
}

// Mould first, then roots and overdue bags, then windows opening: the order the product brief asks for.
const reasonPriority: Record<NextCheckReason, number> = {
  discard_now: 0,
  pull_now: 1,
  overdue: 2,
  window_opens: 3,
  follow_up: 4,
  move_to_next_phase: 5,
  window_daily: 6,
  roots_watch: 6,
  weekly: 7,
};

function findPriority(next: NextCheck, bag: RoundBag, state: BagState): number {
  if (bag.lastCheck && bag.lastCheck.mould !== "clean" && next.reason === "follow_up") return 0;
  if (state === "overdue" && next.reason !== "discard_now" && next.reason !== "pull_now") return reasonPriority.overdue;
  return reasonPriority[next.reason];
}

const collator = new Intl.Collator("en", { numeric: true, sensitivity: "base" });

/** Natural order ("Box 2" before "Box 10") computed once per distinct name, not once per comparison. */
function rankNames(names: Iterable<string>): Map<string, number> {
  const sorted = [...new Set(names)].sort(collator.compare);
  return new Map(sorted.map((n, i) => [n, i]));
}

/**
 * One bag's state and next check on `today`, as the round shows it (a window opening today says so). The one rule
 * Today, the bag page, the check sheet and the digest share; null `next` when nothing is left to check.
 */
export function scheduleBagCheck(bag: RoundBag, today: IsoDay, cadence?: CheckCadence): { state: BagState; next: NextCheck | null } {
  const state = determineBagState(bag, bag.window, today);
  const next = scheduleNextCheck({
    state,
    startedOn: bag.startedOn,
    window: bag.window,
    lastCheck: bag.lastCheck ?? null,
    nextMoveOn: bag.nextMoveOn ?? null,
    cadence,
    checkEveryDays: bag.checkEveryDays ?? null,
    rootsWatchFrom: bag.rootsWatchFrom ?? null,
  });
  const isWindowOpening = next !== null && next.on === today && bag.window?.opensOn === today && next.reason === "window_daily";
  return { state, next: isWindowOpening ? { ...next, reason: "window_opens", note: "Pull window opens today: start daily checks." } : next };
}

/** Computes the bags due on `today` (next check on or before it). Linear in bags plus one sort; shared by phone and server. */
export function buildTodaysRound(bags: readonly RoundBag[], today: IsoDay, cadence?: CheckCadence): TodaysRound {
  const items: RoundItem[] = [];
  for (const bag of bags) {
    const { state, next } = scheduleBagCheck(bag, today, cadence);
    if (!next || next.on > today) continue;
    items.push({ bag, state, next, priority: findPriority(next, bag, state), isLate: next.on < today });
  }
  const storeRank = rankNames(items.map((i) => i.bag.storeName));
  const boxRank = rankNames(items.map((i) => i.bag.box));
  // Each item's ranks looked up once, not twice per comparison (thousands of bags make tens of thousands of them).
  const keyed = items.map((item) => ({ item, p: item.priority, s: storeRank.get(item.bag.storeName)!, b: boxRank.get(item.bag.box)!, c: item.bag.code }));
  keyed.sort((a, b) => a.p - b.p || a.s - b.s || a.b - b.b || (a.c < b.c ? -1 : a.c > b.c ? 1 : 0));
  for (let i = 0; i < keyed.length; i++) items[i] = keyed[i].item;

  const storeMap = new Map<string, RoundStore>();
  const boxMaps = new Map<string, Map<string, RoundBox>>();
  const byReason: Partial<Record<NextCheckReason, number>> = {};
  for (const item of items) {
    byReason[item.next.reason] = (byReason[item.next.reason] ?? 0) + 1;
    let store = storeMap.get(item.bag.storeId);
    if (!store) {
      store = { storeId: item.bag.storeId, storeName: item.bag.storeName, boxes: [], topPriority: item.priority };
      storeMap.set(item.bag.storeId, store);
      boxMaps.set(item.bag.storeId, new Map());
    }
    const boxes = boxMaps.get(item.bag.storeId)!;
    let box = boxes.get(item.bag.box);
    if (!box) {
      box = { box: item.bag.box, items: [] };
      boxes.set(item.bag.box, box);
      store.boxes.push(box);
    }
    box.items.push(item);
  }
  const stores = [...storeMap.values()].sort(
    (a, b) => a.topPriority - b.topPriority || storeRank.get(a.storeName)! - storeRank.get(b.storeName)!,
  );
  return {
    date: today,
    items,
    stores,
    counts: { due: items.length, urgent: items.filter((i) => i.priority <= reasonPriority.window_opens).length, byReason },
  };
}
