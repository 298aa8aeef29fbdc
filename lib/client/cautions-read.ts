import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb, type RimebookDB } from "./db";
import { useIdentity } from "./hooks";
import { readMeta, writeMeta } from "./meta";

// Which cautions a person has read on which bag, remembered on this phone for that person and farm only (a
// helper signing in next sees them in full again). Read cautions fold to a chip on the check sheet.

export interface Reader {
  userId: string;
  farmId: string;
}

const keyOf = (who: Reader) => `cautions_read:${who.userId}:${who.farmId}`;
const entry = (bagId: string, caution: string) => `${bagId}:${caution}`;

/** The cautions `who` has read on `bagId`. */
export async function loadReadCautions(db: RimebookDB, who: Reader, bagId: string): Promise<Set<string>> {
  const all = (await readMeta<string[]>(db, keyOf(who))) ?? [];
  const prefix = `${bagId}:`;
  return new Set(all.filter((e) => e.startsWith(prefix)).map((e) => e.slice(prefix.length)));
}

export async function markCautionsRead(db: RimebookDB, who: Reader, bagId: string, cautions: readonly string[]): Promise<void> {
  await db.transaction("rw", db.meta, async () => {
    const all = new Set((await readMeta<string[]>(db, keyOf(who))) ?? []);
    for (const c of cautions) all.add(entry(bagId, c));
    await writeMeta(db, keyOf(who), [...all]);
  });
}

/** The signed-in person's read cautions on a bag (undefined while loading) and a way to mark more read. */
export function useReadCautions(bagId: string | undefined) {
  const identity = useIdentity();
  const who = identity ? { userId: identity.user.id, farmId: identity.farm.id } : null;
  const read = useLiveQuery(
    async () => (who && bagId ? loadReadCautions(getLocalDb(), who, bagId) : new Set<string>()),
    [who?.userId, who?.farmId, bagId],
  );
  const markRead = async (cautions: readonly string[]) => {
    if (who && bagId) await markCautionsRead(getLocalDb(), who, bagId, cautions);
  };
  return { read, markRead, canRemember: Boolean(who && bagId) };
}
