import { z } from "zod";
import { Id, IsoDay, SyncColumns, optionalText, serverStamped } from "./common";

export const SowingRule = z.discriminatedUnion("anchor", [
  z.object({
    anchor: z.literal("frost"),
    weeks: z.number().min(-26).max(26), // negative = before the last spring frost
    place: z.enum(["indoor", "outdoor"]),
  }),
  z.object({ anchor: z.literal("date"), date: IsoDay, place: z.enum(["indoor", "outdoor"]) }),
]);
export type SowingRule = z.infer<typeof SowingRule>;

const fraction = z.number().gt(0, { error: "Use a share between 0 and 1, e.g. 0.6 for 60 %." }).max(1, { error: "Use a share between 0 and 1, e.g. 0.6 for 60 %." });

export const PlanItem = SyncColumns.extend({
  season: z.number().int().min(2000).max(2200),
  species: z.string().trim().min(1, { error: "Name the species." }).max(200),
  lot_id: Id.nullable().default(null),
  protocol_id: Id.nullable().default(null),
  target_plants: z.number({ error: "How many plants do you want?" }).int().min(1, { error: "Plan for at least one plant." }).max(1_000_000),
  sowing_rule: SowingRule,
  expected_germination: fraction.nullable().default(null), // null = use the farm's history or the default
  expected_survival: fraction.nullable().default(null),
  bag_id: Id.nullable().default(null),
  note: optionalText(1000),
});
export type PlanItem = z.infer<typeof PlanItem>;
export const PlanItemInput = PlanItem.omit(serverStamped);
export type PlanItemInput = z.input<typeof PlanItemInput>;
