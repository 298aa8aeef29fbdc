import { z } from "zod";
import { Id, IsoTimestamp, SyncColumns, optionalText, serverStamped } from "./common";
import { CheckAction, Moisture, Mould, Sprouts } from "./vocabulary";

/** One inspection of a bag. Append-only: a later check corrects an earlier one, nothing is edited. */
export const Check = SyncColumns.extend({
  bag_id: Id,
  checked_at: IsoTimestamp,
  checked_by: z.string().nullable().default(null), // stamped by the server from the session
  moisture: Moisture,
  mould: Mould,
  sprouts: Sprouts,
  actions: z.array(CheckAction).max(6).default([]),
  note: optionalText(2000),
  temperature_c: z.number().min(-60).max(60).nullable().default(null), // optional store reading taken at the check
});
export type Check = z.infer<typeof Check>;
export const CheckInput = Check.omit({ ...serverStamped, checked_by: true });
export type CheckInput = z.input<typeof CheckInput>;

export { allGoodFindings } from "./words";
