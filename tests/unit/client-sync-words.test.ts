import { describe, expect, it } from "vitest";
import { describeSyncStatus, recordNouns, savedWhereWords, unsentWords, type PillInput } from "@/components/shell/sync-words";
import type { WaitingTally } from "@/lib/client/waiting";

// The status pill's words for each state of the sync loop (ARCHITECTURE.md: offline / N waiting /
// synced at HH:MM / needs sign-in / sync error).

const base: PillInput = { phase: "idle", online: true, pending: 0, rejected: 0, photos: 0, lastSyncAt: null };
const at = () => "14:05";

describe("describeSyncStatus", () => {
  it.each([
    [{}, "Not synced yet", "waiting"],
    [{ lastSyncAt: "2026-12-02T14:05:00Z" }, "Synced at 14:05", "ok"],
    [{ pending: 3 }, "3 waiting", "waiting"],
    [{ pending: 2, photos: 1, phase: "syncing" }, "Sending 3…", "waiting"],
    [{ online: false }, "Offline", "calm"],
    [{ online: false, pending: 12 }, "Offline · 12 waiting", "calm"],
    [{ phase: "offline", pending: 1 }, "Offline · 1 waiting", "calm"],
    [{ phase: "needs_sign_in", pending: 4 }, "Needs sign-in · 4 waiting", "alert"],
    [{ phase: "error" }, "Sync error", "alert"],
    [{ rejected: 2, pending: 1, lastSyncAt: "2026-12-02T14:05:00Z" }, "Sync error · 2 not saved", "alert"],
  ] as const)("%j → %s", (patch, text, tone) => {
    expect(describeSyncStatus({ ...base, ...patch } as PillInput, at)).toEqual({ text, tone });
  });
});

describe("waiting words", () => {
  const tally = (parts: WaitingTally["parts"], photos = 0): WaitingTally => ({ records: parts.reduce((s, p) => s + p.n, 0), photos, parts });
  it.each([
    [tally([{ name: "check.record", n: 1 }]), "1 check is"],
    [tally([{ name: "check.record", n: 3 }]), "3 checks are"],
    [tally([], 1), "1 photo is"],
    [tally([{ name: "check.record", n: 2 }], 1), "2 checks and 1 photo are"],
    [tally([{ name: "bag.create", n: 1 }, { name: "check.record", n: 2 }], 3), "1 new bag, 2 checks and 3 photos are"],
  ])("%j → %s", (waiting, words) => expect(unsentWords(waiting)).toBe(words));

  it("names every kind of record, one and many", () => {
    for (const [one, many] of Object.values(recordNouns)) {
      expect(one).not.toBe(many);
      expect(many.length).toBeGreaterThan(0);
    }
  });
});

describe("where a saved record is", () => {
  it.each([
    ["waiting", false, "It goes to the farm when the phone next has signal."],
    ["waiting", true, "Sending it to the farm now."],
    ["sent", true, "It is on the farm now, for everyone on the crew."],
    ["refused", true, "The farm did not take it: tap the sync status at the top to see why."],
  ] as const)("%s, online %s → %s", (where, online, words) => expect(savedWhereWords(where, online)).toBe(words));

  it("never says a record already on the farm waits for signal", () => {
    expect(savedWhereWords("sent", false)).not.toMatch(/signal/);
  });
});
