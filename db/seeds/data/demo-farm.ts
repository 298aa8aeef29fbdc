// The demo farm: an invented restoration nursery. Every name, lot, bag and number here is made up
// for the demo; dates are relative to today so the demo always looks alive.

export const demoFarm = {
  id: "b7a3c1d2-0000-4000-8000-000000000001",
  name: "Bramblewick Native Nursery",
  lastFrostDate: "05-08",
  locationNote: "Valley floor, frost pocket by the lower beds",
};

export const demoMembers = [
  { key: "owner", name: "Wren Alder", email: "wren@bramblewick.example", role: "owner", password: "owner-frost-demo" },
  { key: "grower", name: "Tomas Reed", email: "tomas@bramblewick.example", role: "grower", password: "grower-frost-demo" },
  { key: "helper", name: "Ada Finch", email: "ada@bramblewick.example", role: "helper", password: "helper-frost-demo" },
  { key: "visitor", name: "Juniper Cole", email: "juniper@bramblewick.example", role: "visitor", password: "viewer-frost-demo" },
] as const;

export const demoStores = [
  { key: "barn", name: "Barn fridge", kind: "fridge", boxes: ["Box A", "Box B", "Box C"], holdsFood: false, meanC: 3.4, spreadC: 0.6 },
  { key: "shed", name: "Potting-shed fridge", kind: "fridge", boxes: ["Top shelf", "Crisper"], holdsFood: true, meanC: 4.6, spreadC: 0.9 },
  { key: "freezer", name: "Chest freezer", kind: "freezer", boxes: ["Basket 1"], holdsFood: false, meanC: -18, spreadC: 1.2 },
] as const;

/** Species match the starter protocol rows by botanical name (genus for "spp."). */
export const demoLots = [
  { key: "milkweed", species: "Asclepias syriaca", common: "Common milkweed", source: "Hollow Lane roadside collection", year: 2025, quantity: 420 },
  { key: "showy", species: "Asclepias speciosa", common: "Showy milkweed", source: "Prairie Edge seed co-op", year: 2025, quantity: 260 },
  { key: "narrowleaf", species: "Asclepias fascicularis", common: "Narrowleaf milkweed", source: "Dry Creek bank collection", year: 2024, quantity: 310 },
  { key: "coneflower", species: "Echinacea purpurea", common: "Purple coneflower", source: "Bramblewick stock beds", year: 2025, quantity: 1200 },
  { key: "indigo", species: "Baptisia australis", common: "Blue false indigo", source: "Prairie Edge seed co-op", year: 2025, quantity: 150 },
  { key: "lavender", species: "Lavandula angustifolia", common: "English lavender", source: "Heathside Herbs", year: 2025, quantity: 500 },
  { key: "stjohns", species: "Hypericum perforatum", common: "St John's wort", source: "Heathside Herbs", year: 2024, quantity: 2000 },
  { key: "strawberry", species: "Fragaria vesca", common: "Woodland strawberry", source: "Oakhanger hedge collection", year: 2025, quantity: 600 },
  { key: "ramps", species: "Allium tricoccum", common: "Ramps", source: "Cedar Run woodlot", year: 2025, quantity: 200 },
  { key: "elder", species: "Sambucus", common: "Elderberry", source: "Mill pond thicket", year: 2025, quantity: 350 },
  { key: "susan", species: "Rudbeckia hirta", common: "Black-eyed Susan", source: "Bramblewick stock beds", year: 2025, quantity: 1000 },
  { key: "thistle", species: "Silybum marianum", common: "Milk thistle", source: "Heathside Herbs", year: 2024, quantity: 300 },
] as const;

export type DemoState = "planned" | "chilling" | "window_open" | "overdue" | "pulled" | "sown" | "discarded";

/** About 30 bags in every state. `daysIn` places a chilling bag that many days after its start. */
export const demoBags: Array<{
  lot: (typeof demoLots)[number]["key"];
  state: DemoState;
  store: (typeof demoStores)[number]["key"];
  box: string;
  medium: "paper_towel" | "sand" | "vermiculite" | "peat";
  seeds: number;
  daysIn?: number;
  mouldSpots?: boolean;
  firstRoots?: boolean;
  trialArm?: "fridge" | "freezer";
  germinated?: number;
}> = [
  { lot: "milkweed", state: "chilling", store: "barn", box: "Box A", medium: "paper_towel", seeds: 50, daysIn: 6 },
  { lot: "milkweed", state: "window_open", store: "barn", box: "Box A", medium: "paper_towel", seeds: 50, firstRoots: true },
  { lot: "milkweed", state: "sown", store: "barn", box: "Box A", medium: "sand", seeds: 60, germinated: 41 },
  { lot: "showy", state: "chilling", store: "barn", box: "Box A", medium: "paper_towel", seeds: 40, daysIn: 9 },
  { lot: "showy", state: "window_open", store: "barn", box: "Box B", medium: "vermiculite", seeds: 40 },
  { lot: "narrowleaf", state: "chilling", store: "barn", box: "Box B", medium: "paper_towel", seeds: 40, daysIn: 20, mouldSpots: true },
  { lot: "narrowleaf", state: "overdue", store: "barn", box: "Box B", medium: "sand", seeds: 40 },
  { lot: "coneflower", state: "sown", store: "barn", box: "Box C", medium: "paper_towel", seeds: 50, trialArm: "fridge", germinated: 37 },
  { lot: "coneflower", state: "sown", store: "freezer", box: "Basket 1", medium: "paper_towel", seeds: 50, trialArm: "freezer", germinated: 24 },
  { lot: "coneflower", state: "chilling", store: "shed", box: "Top shelf", medium: "paper_towel", seeds: 100, daysIn: 15 }, // the farm's history turns it daily (demoHistoryBags)
  { lot: "coneflower", state: "window_open", store: "shed", box: "Top shelf", medium: "vermiculite", seeds: 100 },
  { lot: "indigo", state: "chilling", store: "barn", box: "Box C", medium: "sand", seeds: 30, daysIn: 35 },
  { lot: "indigo", state: "planned", store: "barn", box: "Box C", medium: "sand", seeds: 30 },
  { lot: "lavender", state: "chilling", store: "shed", box: "Crisper", medium: "paper_towel", seeds: 80, daysIn: 14 },
  { lot: "lavender", state: "window_open", store: "shed", box: "Crisper", medium: "paper_towel", seeds: 80 },
  { lot: "lavender", state: "discarded", store: "shed", box: "Crisper", medium: "peat", seeds: 80 },
  { lot: "stjohns", state: "chilling", store: "shed", box: "Crisper", medium: "paper_towel", seeds: 200, daysIn: 10 },
  { lot: "stjohns", state: "pulled", store: "shed", box: "Crisper", medium: "paper_towel", seeds: 200 },
  { lot: "strawberry", state: "chilling", store: "barn", box: "Box B", medium: "sand", seeds: 120, daysIn: 40 },
  { lot: "strawberry", state: "chilling", store: "barn", box: "Box B", medium: "sand", seeds: 120, daysIn: 3 },
  { lot: "strawberry", state: "overdue", store: "barn", box: "Box C", medium: "sand", seeds: 120 },
  { lot: "ramps", state: "chilling", store: "barn", box: "Box C", medium: "peat", seeds: 60, daysIn: 25 },
  { lot: "ramps", state: "window_open", store: "barn", box: "Box C", medium: "peat", seeds: 60 },
  { lot: "ramps", state: "planned", store: "barn", box: "Box A", medium: "peat", seeds: 60 },
  { lot: "elder", state: "chilling", store: "barn", box: "Box A", medium: "sand", seeds: 90, daysIn: 50 },
  { lot: "elder", state: "planned", store: "barn", box: "Box A", medium: "sand", seeds: 90 },
  { lot: "milkweed", state: "discarded", store: "barn", box: "Box B", medium: "paper_towel", seeds: 50 },
  { lot: "showy", state: "pulled", store: "barn", box: "Box A", medium: "paper_towel", seeds: 40 },
  { lot: "showy", state: "planned", store: "freezer", box: "Basket 1", medium: "paper_towel", seeds: 40 },
  { lot: "narrowleaf", state: "sown", store: "barn", box: "Box B", medium: "paper_towel", seeds: 40, germinated: 27 },
];

export const demoPlan = [
  // expectedGermination null = let the farm's own counts (Wilson lower bound) decide; numbers are invented for the demo.
  { lot: "coneflower", targetPlants: 400, weeks: -8, place: "indoor", expectedGermination: null },
  { lot: "milkweed", targetPlants: 250, weeks: -6, place: "indoor", expectedGermination: null },
  { lot: "indigo", targetPlants: 60, weeks: -4, place: "outdoor", expectedGermination: 0.5 },
  { lot: "strawberry", targetPlants: 150, weeks: -10, place: "indoor", expectedGermination: 0.6 },
  { lot: "elder", targetPlants: 40, weeks: 0, place: "outdoor", expectedGermination: 0.4 },
] as const;

// ---- Two earlier seasons (invented demo data) -------------------------------------------------------------------
// Finished bags the farm's own history reads: the day a check first saw roots, or the day an unfinished bag ended.
// Coneflower in these fridges showed roots well before the published 4 weeks, so the demo has a window to suggest;
// strawberry has too few finished bags for a window of its own yet.

/** Older lots for the season two springs ago (the current lots were collected after it). */
export const demoHistoryLots = [
  { key: "coneflower_old", species: "Echinacea purpurea", common: "Purple coneflower", source: "Bramblewick stock beds", year: 2024, quantity: 900 },
  { key: "milkweed_old", species: "Asclepias syriaca", common: "Common milkweed", source: "Hollow Lane roadside collection", year: 2024, quantity: 380 },
  { key: "lavender_old", species: "Lavandula angustifolia", common: "English lavender", source: "Heathside Herbs", year: 2024, quantity: 400 },
] as const;

type HistoryLotKey = (typeof demoLots)[number]["key"] | (typeof demoHistoryLots)[number]["key"];

export interface DemoHistoryBag {
  lot: HistoryLotKey;
  /** 1: last season's bags (started about a year before today); 2: the season before. */
  seasonsAgo: 1 | 2;
  store: "barn" | "shed";
  box: string;
  /** Day in the cold a check first saw roots; null: the bag ended without roots on `endDay`. */
  rootsDay: number | null;
  endDay?: number;
  end?: "pulled" | "discarded";
}

const hb = (lot: HistoryLotKey, seasonsAgo: 1 | 2, store: "barn" | "shed", box: string, rootsDay: number | null, endDay?: number, end?: "pulled" | "discarded"): DemoHistoryBag => ({
  lot, seasonsAgo, store, box, rootsDay, endDay, end,
});

export const demoHistoryBags: DemoHistoryBag[] = [
  // Coneflower: published 28 days; here roots from day 18.
  hb("coneflower_old", 2, "barn", "Box A", 19), hb("coneflower_old", 2, "barn", "Box A", 21), hb("coneflower_old", 2, "shed", "Top shelf", 24),
  hb("coneflower_old", 2, "barn", "Box B", 20), hb("coneflower_old", 2, "shed", "Top shelf", 26), hb("coneflower_old", 2, "barn", "Box C", null, 30, "pulled"),
  hb("coneflower", 1, "barn", "Box A", 18), hb("coneflower", 1, "barn", "Box B", 22), hb("coneflower", 1, "shed", "Top shelf", 23),
  hb("coneflower", 1, "barn", "Box C", 21), hb("coneflower", 1, "shed", "Crisper", null, 12, "discarded"), hb("coneflower", 1, "shed", "Top shelf", 25),
  // Common milkweed: published 14 days; here roots inside or after it.
  hb("milkweed_old", 2, "barn", "Box A", 16), hb("milkweed_old", 2, "barn", "Box A", 19), hb("milkweed_old", 2, "barn", "Box B", 21),
  hb("milkweed", 1, "barn", "Box A", 17), hb("milkweed", 1, "barn", "Box B", 18), hb("milkweed", 1, "shed", "Top shelf", 22), hb("milkweed", 1, "barn", "Box A", null, 25, "pulled"),
  // Lavender: no published upper limit; slow, with unfinished bags.
  hb("lavender_old", 2, "shed", "Crisper", 38), hb("lavender_old", 2, "shed", "Crisper", 45), hb("lavender_old", 2, "shed", "Crisper", null, 20, "discarded"),
  hb("lavender", 1, "shed", "Crisper", 41), hb("lavender", 1, "shed", "Top shelf", 36), hb("lavender", 1, "shed", "Crisper", null, 60, "pulled"), hb("lavender", 1, "barn", "Box C", 52),
  // St John's wort: published 30 days at 10 °C.
  hb("stjohns", 1, "shed", "Crisper", 29), hb("stjohns", 1, "shed", "Crisper", 33), hb("stjohns", 1, "shed", "Crisper", 31),
  // Woodland strawberry: too few finished bags for a window of its own yet.
  hb("strawberry", 1, "barn", "Box B", 80), hb("strawberry", 1, "barn", "Box B", null, 90, "pulled"),
];
