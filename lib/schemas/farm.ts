import { z } from "zod";
import { Role } from "./vocabulary";

export const FarmSettings = z.object({
  name: z.string().trim().min(1, { error: "Give the farm a name." }).max(120),
  last_frost_date: z.string().regex(/^(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/, { error: "Use month-day, like 05-10 for 10 May." }).nullable().default(null),
  location_note: z.string().trim().max(200).nullable().default(null),
  temperature_unit: z.enum(["C", "F"]).default("C"),
  weekly_check_days: z.number().int().min(1).max(30).default(7),
  timezone: z.string().min(1).max(64).default("UTC"),
});
export type FarmSettings = z.infer<typeof FarmSettings>;

export const Membership = z.object({
  id: z.string(),
  farm_id: z.string(),
  user_id: z.string(),
  role: Role,
  digest_opt_in: z.boolean(),
});
export type Membership = z.infer<typeof Membership>;
