import { z } from "zod";
import { SyncColumns, optionalText, serverStamped } from "./common";
import { StoreKind } from "./vocabulary";

export const Store = SyncColumns.extend({
  name: z.string().trim().min(1, { error: "Give the cold store a name, e.g. Barn fridge." }).max(100),
  kind: StoreKind,
  boxes: z.array(z.string().trim().min(1).max(60)).max(100).default([]),
  holds_food: z.boolean().default(false), // shared with food: cautions apply
  notes: optionalText(1000),
});
export type Store = z.infer<typeof Store>;
export const StoreInput = Store.omit(serverStamped);
export type StoreInput = z.input<typeof StoreInput>;
