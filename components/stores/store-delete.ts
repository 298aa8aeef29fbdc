import { AppError } from "@/lib/errors";
import { assertStoreCanBeDeleted, type BagPlace } from "@/lib/domain/store-rules";
import type { Store } from "@/lib/schemas/store";

/** Why the store cannot go now (the lib/domain rule the server runs too), or null when it may be deleted. */
export function explainStoreRefusal(store: Pick<Store, "name">, bagsOfStore: readonly BagPlace[]): string | null {
  try {
    assertStoreCanBeDeleted(store.name, bagsOfStore);
    return null;
  } catch (e) {
    if (e instanceof AppError) return e.message;
    throw e;
  }
}

/** What the confirmation says about the store's readings. */
export function describeStoreDelete(readingCount: number): string[] {
  return [
    "It leaves the list of cold stores on every phone once this one syncs. No bag is in it now.",
    readingCount
      ? `Its ${readingCount} temperature reading${readingCount === 1 ? " is" : "s are"} kept for the record (they stay in the readings export), and finished bags keep their history.`
      : "Finished bags that were in it keep their history.",
  ];
}
