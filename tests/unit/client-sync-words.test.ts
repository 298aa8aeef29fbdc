import { describe, expect, it } from "vitest";
import { describeSyncStatus, unsentWords, type PillInput } from "@/components/shell/sync-words";

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

describe("unsentWords", () => {
  it.each([
    [{ pending: 1, photos: 0 }, "1 change is"],
    [{ pending: 3, photos: 0 }, "3 changes are"],
    [{ pending: 0, photos: 1 }, "1 photo is"],
    [{ pending: 2, photos: 1 }, "2 changes and 1 photo are"],
  ])("%j → %s", (counts, words) => expect(unsentWords(counts)).toBe(words));
});
