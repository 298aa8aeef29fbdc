import { z } from "zod";
import { Id, SyncColumns } from "./common";

export const Photo = SyncColumns.extend({
  bag_id: Id,
  check_id: Id.nullable().default(null),
  path: z.string().min(1),
  mime: z.enum(["image/jpeg", "image/png", "image/webp"]),
  bytes: z.number().int().positive(),
  uploaded_by: z.string().nullable().default(null),
});
export type Photo = z.infer<typeof Photo>;

export const photoLimits = { maxBytes: 5 * 1024 * 1024, mimes: ["image/jpeg", "image/png", "image/webp"] as const };
