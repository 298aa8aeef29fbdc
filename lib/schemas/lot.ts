import { z } from "zod";
import { Id, SyncColumns, optionalText, serverStamped } from "./common";

export const Lot = SyncColumns.extend({
  species: z.string().trim().min(1, { error: "Name the species." }).max(200),
  common_name: optionalText(200),
  source: optionalText(200), // vendor, collection site, seed library
  year: z.number().int().min(1900, { error: "Give the year the seed was harvested or bought." }).max(2200).nullable().default(null),
  quantity: z.number().int().min(0, { error: "Seed count cannot be negative." }).nullable().default(null),
  protocol_id: Id.nullable().default(null),
  treated: z.boolean().default(false), // chemically treated seed: poisonous, never near food
  notes: optionalText(2000),
});
export type Lot = z.infer<typeof Lot>;
export const LotInput = Lot.omit(serverStamped);
export type LotInput = z.input<typeof LotInput>;
