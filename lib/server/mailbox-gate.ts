import "server-only";
import { env } from "./env";
import { isLoopback } from "./front-door.mjs";

/**
 * Whether captured mail (every reset and invite link) may be shown to a caller at `address` (null:
 * unknown): only when MAILBOX_PAGE=on, and then only to this computer unless MAILBOX_PAGE_REMOTE=on.
 */
export function mailboxOpenTo(address: string | null): boolean {
  if (!env.mailboxPage) return false;
  return env.mailboxRemote || isLoopback(address);
}
