import { z } from "zod";
import { Id, IsoDay, SyncColumns, optionalText, serverStamped } from "./common";
import { Medium } from "./vocabulary";

export const BagCode = z.string().trim().min(4).max(16).regex(/^[0-9A-Z*~$=U-]+$/i, { error: "A bag code uses letters and digits only." });

export const Bag = SyncColumns.extend({
  code: BagCode,
  lot_id: Id,
  protocol_id: Id.nullable().default(null),
  store_id: Id.nullable().default(null),
  box: optionalText(60),
  medium: Medium.default("paper_towel"),
  seed_count: z.number().int().min(1, { error: "A bag holds at least one seed." }).max(10_000_000).nullable().default(null),
  start_date: IsoDay.nullable().default(null), // null while planned
  planned_start_date: IsoDay.nullable().default(null),
  window_start: IsoDay.nullable().default(null), // snapshot from lib/domain at the last write
  window_end: IsoDay.nullable().default(null),
  pulled_on: IsoDay.nullable().default(null),
  sown_on: IsoDay.nullable().default(null),
  discarded_on: IsoDay.nullable().default(null),
  discard_reason: optionalText(500),
  trial_arm_id: Id.nullable().default(null),
  plan_item_id: Id.nullable().default(null),
  check_every_days: z.number().int().min(1).max(60).nullable().default(null),
  note: optionalText(2000),
});
export type Bag = z.infer<typeof Bag>;
export const BagInput = Bag.omit(serverStamped);
export type BagInput = z.input<typeof BagInput>;
/** Fields an edit may change; identity and lifecycle dates have their own mutations. */
export const BagPatch = Bag.pick({
  protocol_id: true, store_id: true, box: true, medium: true, seed_count: true, start_date: true,
  planned_start_date: true, window_start: true, window_end: true, trial_arm_id: true, check_every_days: true, note: true,
}).partial();
export type BagPatch = z.infer<typeof BagPatch>;
