import { z } from "zod";
import { Id, SyncColumns, optionalText, serverStamped } from "./common";

export const Trial = SyncColumns.extend({
  name: z.string().trim().min(1, { error: "Give the trial a name." }).max(200),
  lot_id: Id.nullable().default(null),
  question: optionalText(1000),
  notes: optionalText(2000),
});
export type Trial = z.infer<typeof Trial>;

export const TrialArm = SyncColumns.extend({
  trial_id: Id,
  label: z.string().trim().min(1, { error: "Name this arm, e.g. Freezer 60 days." }).max(100),
  treatment: optionalText(500),
  position: z.number().int().min(0).max(100).default(0),
});
export type TrialArm = z.infer<typeof TrialArm>;

export const TrialInput = Trial.omit(serverStamped).extend({
  arms: z.array(TrialArm.omit(serverStamped).omit({ trial_id: true })).min(2, { error: "A trial compares at least two treatments." }).max(8),
});
export type TrialInput = z.input<typeof TrialInput>;

/** The trial's own fields, without its arms: what an edit may change (bags point at the arms, so they stay). */
export const TrialDetails = TrialInput.omit({ id: true, arms: true });
export type TrialDetails = z.input<typeof TrialDetails>;
