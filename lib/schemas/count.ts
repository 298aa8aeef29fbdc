import { z } from "zod";
import { Id, IsoDay, SyncColumns, optionalText, serverStamped } from "./common";

/** A germination count: the cumulative number of seedlings up on a day. Append-only. */
export const Count = SyncColumns.extend({
  sowing_id: Id,
  counted_on: IsoDay,
  germinated_total: z.number({ error: "Enter how many have come up so far." }).int().min(0, { error: "A count cannot be negative." }).max(1_000_000),
  note: optionalText(1000),
});
export type Count = z.infer<typeof Count>;
export const CountInput = Count.omit(serverStamped);
export type CountInput = z.input<typeof CountInput>;
