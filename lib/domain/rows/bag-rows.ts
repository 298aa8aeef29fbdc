import type { Bag } from "@/lib/schemas/bag";
import type { Lot } from "@/lib/schemas/lot";
import type { Reading } from "@/lib/schemas/reading";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";
import type { BagState, Medium, StoreKind } from "@/lib/schemas/words";
import { bagStates } from "@/lib/schemas/words";
import { formatBagCode } from "@/lib/domain/bag-codes";
import type { TemperatureReading } from "@/lib/domain/cold-exposure";
import { addDaysToIsoDay, parseIsoDay, type IsoDay } from "@/lib/domain/dates";
import { findEffectiveWindow, parseReadingTime, prepareStoreReadings, sortStoreReadings, type EffectiveWindow, type StoreReadings, type WindowBasis } from "@/lib/domain/effective-window";
import { reconcileProtocol, type ReconciledProtocol } from "@/lib/domain/protocols";
import { computePullWindow, determineBagState, planBagPhases, type BagPlan, type PullWindow } from "@/lib/domain/schedule";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
import { TupleMemo } from "@/lib/domain/memo";

// Pure helpers behind the bags table: one row per bag with its state and window worked out on the phone
// (never stored), plus the filter chips and the sort orders. No React here, so tests run without a DOM.
// The same rows feed Today's round, the labels, the check sheet and the server's digest, so a bag's window and
// state read the same everywhere: the effective window (shifted by cold lost in its store) from lib/domain.

export interface BagRow {
  id: string;
  code: string;
  /** "K7M4-4QZX": easier to read aloud. */
  codeShown: string;
  lotId: string;
  species: string;
  commonName: string;
  storeId: string | null;
  storeName: string;
  box: string;
  medium: Medium;
  seedCount: number | null;
  startedOn: IsoDay | null;
  plannedStartOn: IsoDay | null;
  /** The effective window: the planned one moved by cold days lost in the store. */
  window: PullWindow | null;
  plannedWindow: PullWindow | null;
  lostColdDays: number;
  windowBasis: WindowBasis;
  /** Plain words on why the window is where it is. */
  windowNote: string;
  state: BagState;
  nextMoveOn: IsoDay | null;
  /** The bag's own days between checks before its window; null: the farm's rhythm. */
  checkEveryDays: number | null;
}

/** The bag's planned pull window: from its protocol when it has one, else the window stored when it was last written. */
export function findBagWindow(bag: Pick<Bag, "start_date" | "window_start" | "window_end">, protocol: ProtocolRow | null): PullWindow | null {
  if (bag.start_date && protocol && !protocol.deleted_at) {
    const computed = computePullWindow(readProtocolRow(protocol), bag.start_date);
    if (computed) return computed;
  }
  return readStoredWindow(bag);
}

function readStoredWindow(bag: Pick<Bag, "window_start" | "window_end">): PullWindow | null {
  if (!bag.window_start) return null;
  return { opensOn: bag.window_start, closesOn: bag.window_end ?? null, plannedPullOn: bag.window_start, sourcesDisagree: false };
}

export type ReadingRow = Pick<Reading, "store_id" | "taken_at" | "temperature_c"> & { deleted_at?: string | null };

/** A store's reading rows as lib/domain reads them (°C, tombstones left out). */
export function toTemperatureReadings(readings: readonly Omit<ReadingRow, "store_id">[]): TemperatureReading[] {
  return readings.filter((r) => !r.deleted_at).map((r) => ({ at: r.taken_at, value: r.temperature_c, unit: "C" as const }));
}

/**
 * Each store's readings sorted once, for every bag in it: counted, then written straight into arrays (a logger season
 * is many rows). The phone reads a store's readings together, so a run of one store costs no look-up per reading.
 */
export function prepareReadingsByStore(readings: readonly ReadingRow[]): Map<string, StoreReadings> {
  const counts = new Map<string, number>();
  for (let i = 0; i < readings.length; ) {
    const r = readings[i];
    const id = r.store_id;
    let n = 0;
    for (; i < readings.length && readings[i].store_id === id; i++) if (!readings[i].deleted_at) n++;
    counts.set(id, (counts.get(id) ?? 0) + n);
  }
  const filling = new Map<string, { times: Float64Array; celsius: Float64Array; at: number }>();
  for (const [id, n] of counts) if (n > 0) filling.set(id, { times: new Float64Array(n), celsius: new Float64Array(n), at: 0 });
  for (let i = 0; i < readings.length; ) {
    const id = readings[i].store_id;
    const into = filling.get(id);
    for (; i < readings.length && readings[i].store_id === id; i++) {
      const r = readings[i];
      if (r.deleted_at || !into) continue;
      into.times[into.at] = parseReadingTime(r.taken_at);
      into.celsius[into.at++] = r.temperature_c;
    }
  }
  const out = new Map<string, StoreReadings>();
  for (const [id, { times, celsius }] of filling) out.set(id, sortStoreReadings(times, celsius));
  return out;
}

/**
 * Each store's prepared readings kept between rounds (Today reworks its round on every change in the phone store,
 * and parsing a logger's season of timestamps was a fifth of each round). A store whose readings are the same as
 * last time, row for row (time, temperature, tombstone, in the same order), keeps its prepared arrays; a reading
 * added, changed or removed prepares that store again. `prepare` answers exactly what prepareReadingsByStore answers.
 */
export class StoreReadingsCache {
  private kept = new Map<string, { rows: ReadingRow[]; prepared: StoreReadings | null }>();
  /** Stores prepared afresh by the last `prepare` (for the benchmark and tests). */
  preparedLastTime = 0;

  prepare(readings: readonly ReadingRow[]): Map<string, StoreReadings> {
    // Group by store keeping each store's order (the phone reads a store's readings together, so runs are long).
    const byStore = new Map<string, ReadingRow[]>();
    for (let i = 0; i < readings.length; ) {
      const id = readings[i].store_id;
      let list = byStore.get(id);
      if (!list) byStore.set(id, (list = []));
      for (; i < readings.length && readings[i].store_id === id; i++) list.push(readings[i]);
    }
    const out = new Map<string, StoreReadings>();
    const next = new Map<string, { rows: ReadingRow[]; prepared: StoreReadings | null }>();
    this.preparedLastTime = 0;
    for (const [id, rows] of byStore) {
      let entry = this.kept.get(id);
      if (!entry || !sameReadings(entry.rows, rows)) {
        entry = { rows, prepared: prepareReadingsByStore(rows).get(id) ?? null };
        this.preparedLastTime++;
      }
      next.set(id, entry);
      if (entry.prepared) out.set(id, entry.prepared);
    }
    this.kept = next;
    return out;
  }
}

function sameReadings(a: readonly ReadingRow[], b: readonly ReadingRow[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (x !== y && (x.taken_at !== y.taken_at || !Object.is(x.temperature_c, y.temperature_c) || !x.deleted_at !== !y.deleted_at)) return false;
  }
  return true;
}

const noReadings = prepareStoreReadings([]);

export type BagForWindow = Pick<Bag, "start_date" | "window_start" | "window_end" | "pulled_on" | "sown_on" | "discarded_on" | "store_id">;

export interface WindowClock {
  /** Count readings up to this moment (ms); default: the end of `today`. */
  asOf?: number;
  /** Start of a calendar day in ms (the server passes the farm's time zone); default: the device's local midnight. */
  startOfDay?: (day: IsoDay) => number;
}

export interface BagWindowOptions extends WindowClock {
  /** Only a fridge's readings move the window. */
  storeKind?: StoreKind | null;
  /** The bag's phase plan when already worked out (bags started together on one protocol share it). */
  plan?: BagPlan | null;
}

/**
 * The bag's effective window (lib/domain findEffectiveWindow) from its rows: its live protocol (or stored window) and
 * its store's readings. `storeReadings`: the bag's store's readings, prepared; null or undefined when it has none here.
 */
export function findEffectiveBagWindow(
  bag: BagForWindow,
  protocol: ProtocolRow | ReconciledProtocol | null,
  storeReadings: StoreReadings | null | undefined,
  today: IsoDay,
  options: BagWindowOptions = {},
): EffectiveWindow {
  const live = protocol && "deleted_at" in protocol ? (protocol.deleted_at ? null : reconcileProtocol(readProtocolRow(protocol))) : protocol;
  const startOfDay = options.startOfDay ?? ((d: IsoDay) => parseIsoDay(d).getTime());
  return findEffectiveWindow({
    bag: { startedOn: bag.start_date ?? null, pulledOn: bag.pulled_on, sownOn: bag.sown_on, discardedOn: bag.discarded_on },
    protocol: live,
    storedWindow: readStoredWindow(bag),
    plan: options.plan,
    // A bag in a store with no readings on this phone: nothing to count, the window stays as planned (and says so).
    readings: bag.store_id ? (storeReadings ?? noReadings) : null,
    storeKind: options.storeKind ?? null,
    asOf: options.asOf ?? startOfDay(addDaysToIsoDay(today, 1)),
    startOfDay,
  });
}

export interface BagRowSources {
  bags: readonly Bag[];
  lots: readonly Lot[];
  protocols: readonly ProtocolRow[];
  stores: readonly Store[];
  /** The stores' temperature readings; without them every window stays as planned. */
  readings?: readonly ReadingRow[];
  /** Keeps each store's prepared readings between calls (the phone's Today); the answer is the same without it. */
  readingsCache?: StoreReadingsCache;
}

/** In a window group's inputs where the stored window is not read (the protocol plans the window). */
const storedWindowUnread = Symbol("stored window unread");

/**
 * Everything a bag's window and state are worked out from within one buildBagRows call: its live protocol (by id: the
 * call reconciles each protocol row once), start day, stored window (read only when the protocol plans none), store
 * (its kind and readings are the call's), and pulled, sown and discarded days. `today` and the clock are the call's
 * own, the same for every bag.
 */
function windowGroupInputs(protocolId: string | null, bag: BagForWindow, readsStoredWindow: boolean): unknown[] {
  return [
    protocolId,
    bag.start_date,
    readsStoredWindow ? bag.window_start : storedWindowUnread,
    readsStoredWindow ? bag.window_end : storedWindowUnread,
    bag.pulled_on,
    bag.sown_on,
    bag.discarded_on,
    bag.store_id,
  ];
}

/** One row per live bag; window and state come from lib/domain for `today`. */
export function buildBagRows({ bags, lots, protocols, stores, readings = [], readingsCache }: BagRowSources, today: IsoDay, clock: WindowClock = {}): BagRow[] {
  const lotById = new Map(lots.map((l) => [l.id, l]));
  const storeById = new Map(stores.map((s) => [s.id, s]));
  // Work each protocol and each store's readings out once, not once per bag (Today has thousands of bags).
  const reconciled = new Map(protocols.filter((p) => !p.deleted_at).map((p) => [p.id, reconcileProtocol(readProtocolRow(p))]));
  const readingsByStore = readingsCache ? readingsCache.prepare(readings) : prepareReadingsByStore(readings);
  const dayStarts = new Map<IsoDay, number>();
  const startOfDay = clock.startOfDay ?? ((d: IsoDay) => parseIsoDay(d).getTime());
  const cachedStartOfDay = (d: IsoDay) => {
    let ms = dayStarts.get(d);
    if (ms === undefined) dayStarts.set(d, (ms = startOfDay(d)));
    return ms;
  };
  // Bags started the same day on the same protocol share one phase plan.
  const plans = new TupleMemo<BagPlan>();
  const planFor = (protocolId: string, protocol: ReconciledProtocol, startedOn: IsoDay) =>
    plans.find([protocolId, startedOn]) ?? plans.remember([protocolId, startedOn], planBagPhases(protocol, startedOn));
  // Bags whose window inputs are the same share one window and state (Today's 10,000 bags form a few hundred groups).
  const groups = new TupleMemo<{ effective: EffectiveWindow; state: BagState }>();
  const rows: BagRow[] = [];
  for (const bag of bags) {
    if (bag.deleted_at) continue;
    const lot = lotById.get(bag.lot_id);
    const protocolId = bag.protocol_id ?? lot?.protocol_id ?? null;
    const store = bag.store_id ? storeById.get(bag.store_id) : undefined;
    const protocol = protocolId ? (reconciled.get(protocolId) ?? null) : null;
    const plan = protocol && protocolId && bag.start_date ? planFor(protocolId, protocol, bag.start_date) : undefined;
    const inputs = windowGroupInputs(protocol ? protocolId : null, bag, !plan?.window);
    let group = groups.find(inputs);
    if (!group) {
      const effective = findEffectiveBagWindow(bag, protocol, bag.store_id ? readingsByStore.get(bag.store_id) : null, today, {
        asOf: clock.asOf,
        startOfDay: cachedStartOfDay,
        storeKind: store?.kind ?? null,
        plan,
      });
      const state = determineBagState(
        { startedOn: bag.start_date ?? null, pulledOn: bag.pulled_on, sownOn: bag.sown_on, discardedOn: bag.discarded_on },
        effective.window,
        today,
      );
      group = groups.remember(inputs, { effective, state });
    }
    const { effective, state } = group;
    rows.push({
      id: bag.id,
      code: bag.code,
      codeShown: formatBagCode(bag.code),
      lotId: bag.lot_id,
      species: lot?.species ?? "Unknown lot",
      commonName: lot?.common_name ?? "",
      storeId: bag.store_id ?? null,
      storeName: store?.name ?? (bag.store_id ? "Unknown store" : "No store"),
      box: bag.box ?? "",
      medium: bag.medium,
      seedCount: bag.seed_count ?? null,
      startedOn: bag.start_date ?? null,
      plannedStartOn: bag.planned_start_date ?? null,
      window: effective.window,
      plannedWindow: effective.planned,
      lostColdDays: effective.lostDays,
      windowBasis: effective.basis,
      windowNote: effective.reason,
      state,
      nextMoveOn: effective.nextMoveOn,
      checkEveryDays: bag.check_every_days ?? null,
    });
  }
  return rows;
}

// ---- Filters -------------------------------------------------------------------------------------

export const windowFilters = ["opens_this_week", "open_now", "closes_this_week", "past_latest", "no_window"] as const;
export type WindowFilter = (typeof windowFilters)[number];
export const windowFilterLabels: Record<WindowFilter, string> = {
  opens_this_week: "Opens within 7 days",
  open_now: "Open now",
  closes_this_week: "Closes within 7 days",
  past_latest: "Past latest pull",
  no_window: "No window",
};

/**
 * States that still need a person: about to go in, in the cold, and pulled but not yet sown. The table opens on
 * these so a pulled bag never drops out of sight before it is sown.
 */
export const activeStates: readonly BagState[] = ["planned", "chilling", "window_open", "overdue", "pulled"];

export interface BagFilters {
  /** Empty means every state. */
  states: readonly BagState[];
  storeIds: readonly string[];
  species: readonly string[];
  window: WindowFilter | null;
  /** Free text matched against code, species, common name, store and box. */
  text: string;
}

export const emptyBagFilters: BagFilters = { states: [], storeIds: [], species: [], window: null, text: "" };
export const defaultBagFilters: BagFilters = { ...emptyBagFilters, states: activeStates };

const isLive = (s: BagState) => s === "chilling" || s === "window_open" || s === "overdue";

/** Whether a row falls in a window filter on `today`. Only bags still in the cold have an open or closing window. */
export function matchesWindowFilter(row: Pick<BagRow, "window" | "state">, filter: WindowFilter, today: IsoDay): boolean {
  const w = row.window;
  if (filter === "no_window") return w === null;
  if (!w) return false;
  const weekAhead = addDaysToIsoDay(today, 7);
  switch (filter) {
    case "opens_this_week":
      return (row.state === "chilling" || row.state === "planned") && w.opensOn > today && w.opensOn <= weekAhead;
    case "open_now":
      return row.state === "window_open";
    case "closes_this_week":
      return isLive(row.state) && w.closesOn !== null && w.closesOn >= today && w.closesOn <= weekAhead;
    case "past_latest":
      return row.state === "overdue";
  }
}

function normalizeText(s: string): string {
  return s.toLowerCase().replace(/[\s-]+/g, "");
}

export function filterBagRows(rows: readonly BagRow[], filters: BagFilters, today: IsoDay): BagRow[] {
  const text = normalizeText(filters.text.trim());
  return rows.filter((r) => {
    if (filters.states.length && !filters.states.includes(r.state)) return false;
    if (filters.storeIds.length && !filters.storeIds.includes(r.storeId ?? "")) return false;
    if (filters.species.length && !filters.species.includes(r.species)) return false;
    if (filters.window && !matchesWindowFilter(r, filters.window, today)) return false;
    if (text) {
      const hay = normalizeText([r.code, r.species, r.commonName, r.storeName, r.box].join(" "));
      if (!hay.includes(text)) return false;
    }
    return true;
  });
}

/** Toggles one value in a chip group (immutable). */
export function toggleChip<T>(values: readonly T[], value: T): T[] {
  return values.includes(value) ? values.filter((v) => v !== value) : [...values, value];
}

/** Counts per state among rows, for the chip labels. */
export function countByState(rows: readonly BagRow[]): Record<BagState, number> {
  const out = Object.fromEntries(bagStates.map((s) => [s, 0])) as Record<BagState, number>;
  for (const r of rows) out[r.state]++;
  return out;
}

// ---- Sorting -------------------------------------------------------------------------------------

export const bagSortKeys = ["window", "state", "species", "store", "code", "started"] as const;
export type BagSortKey = (typeof bagSortKeys)[number];
export const bagSortLabels: Record<BagSortKey, string> = {
  window: "Pull window",
  state: "State",
  species: "Species",
  store: "Store and box",
  code: "Bag code",
  started: "Start date",
};

const collator = new Intl.Collator("en", { numeric: true, sensitivity: "base" });
/** Lifecycle order, with the bags that need hands first among those in the cold. */
const stateOrder: Record<BagState, number> = { overdue: 0, window_open: 1, chilling: 2, planned: 3, pulled: 4, sown: 5, discarded: 6 };

/** Missing values sort last in both directions' natural reading: compare returns them as "greater". */
function compareDays(a: IsoDay | null, b: IsoDay | null): number {
  if (a === b) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  return a < b ? -1 : 1;
}

/** Ascending comparison for one key; ties fall back to the bag code so the order is stable. */
export function compareBagRows(key: BagSortKey, a: BagRow, b: BagRow): number {
  let c = 0;
  switch (key) {
    case "window":
      c = compareDays(a.window?.opensOn ?? null, b.window?.opensOn ?? null) || compareDays(a.window?.closesOn ?? null, b.window?.closesOn ?? null);
      break;
    case "state":
      c = stateOrder[a.state] - stateOrder[b.state] || compareDays(a.window?.opensOn ?? null, b.window?.opensOn ?? null);
      break;
    case "species":
      c = collator.compare(a.species, b.species);
      break;
    case "store":
      c = collator.compare(a.storeName, b.storeName) || collator.compare(a.box, b.box);
      break;
    case "code":
      c = 0;
      break;
    case "started":
      c = compareDays(a.startedOn ?? a.plannedStartOn, b.startedOn ?? b.plannedStartOn);
      break;
  }
  return c || collator.compare(a.code, b.code);
}

export function sortBagRows(rows: readonly BagRow[], key: BagSortKey, descending = false): BagRow[] {
  const sign = descending ? -1 : 1;
  return [...rows].sort((a, b) => sign * compareBagRows(key, a, b));
}

/**
 * Short words for a row's window, e.g. "Opens 12 Mar" / "Open until 20 Mar" / "No window"; a window moved by cold
 * the bag lost says so ("Opens 14 Mar, 2 days later: cold lost").
 */
export function describeRowWindow(row: Pick<BagRow, "window" | "state"> & Partial<Pick<BagRow, "lostColdDays">>, formatDay: (d: IsoDay) => string): string {
  const w = row.window;
  if (!w) return "No window";
  const lost = row.lostColdDays ?? 0;
  const moved = lost > 0 ? `, ${lost === 1 ? "1 day" : `${lost} days`} later: cold lost` : "";
  const closes = w.closesOn ? formatDay(w.closesOn) : "roots show";
  if (row.state === "window_open") return `Open until ${closes}${moved}`;
  if (row.state === "overdue") return `Latest was ${closes}${moved}`;
  if (row.state === "chilling" || row.state === "planned") return `Opens ${formatDay(w.opensOn)}${moved}`;
  return `${formatDay(w.opensOn)} – ${w.closesOn ? formatDay(w.closesOn) : "open-ended"}${moved}`;
}
