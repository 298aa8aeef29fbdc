import { unsentWords } from "@/components/shell/sync-words";
import type { LeftBehind } from "@/lib/client/farm-switch";

// What the account cards in Settings say. Pure, so the wording is tested without a browser.

/** Why the phone will not switch farms yet, and what to do about it. */
export function describeLeftBehind(farmName: string, left: LeftBehind): string {
  const parts: string[] = [];
  if (left.pending + left.photos > 0) {
    parts.push(
      `${unsentWords(left.waiting)} still only on this phone and could not be sent to ${farmName} just now. ` +
        `Switching farms empties this phone's copy of the farm, so Rimebook will not switch until ${left.pending + left.photos === 1 ? "it has" : "they have"} gone up. ` +
        `Find signal, wait for “Synced” at the top, then switch.`,
    );
  }
  if (left.refused > 0) {
    parts.push(
      `${left.refused} change${left.refused === 1 ? "" : "s"} ${farmName} refused ${left.refused === 1 ? "is" : "are"} still on this phone. ` +
        `Tap the sync status at the top and try ${left.refused === 1 ? "it" : "them"} again or let ${left.refused === 1 ? "it" : "them"} go first, so nothing is sent to the wrong farm.`,
    );
  }
  return parts.join(" ");
}

