import { z } from "zod";
import { Id, IsoDay, SyncColumns, optionalText, serverStamped } from "./common";

export const Sowing = SyncColumns.extend({
  bag_id: Id,
  sown_on: IsoDay,
  tray: optionalText(60),
  cells: z.number().int().min(1).max(10_000).nullable().default(null),
  seeds_sown: z.number({ error: "How many seeds were sown?" }).int().min(1, { error: "Sow at least one seed." }).max(1_000_000),
  note: optionalText(2000),
});
export type Sowing = z.infer<typeof Sowing>;
export const SowingInput = Sowing.omit(serverStamped);
export type SowingInput = z.input<typeof SowingInput>;
