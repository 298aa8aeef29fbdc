// Steps most real-browser tests share: sign in through the form, wait for the service worker to take
// control, read the server's SQLite file directly.
import Database from "better-sqlite3";
import type { Page } from "playwright-core";

export type Credentials = { email: string; password: string };

/** Signs in through the sign-in form and waits for Today. */
export async function signIn(page: Page, who: Credentials): Promise<void> {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(who.email);
  await page.getByLabel("Password", { exact: true }).fill(who.password);
  await page.getByRole("button", { name: /sign in/i }).click();
  await page.waitForURL(/\/today/, { timeout: 30_000 });
}

/** Waits until the service worker is installed (everything precached) and controls the page. */
export async function waitForServiceWorker(page: Page): Promise<void> {
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
  });
  if (!(await page.evaluate(() => Boolean(navigator.serviceWorker.controller)))) await page.reload();
  await page.waitForFunction(() => Boolean(navigator.serviceWorker.controller), undefined, { timeout: 30_000 });
}

/** Rows from the server's database file (read-only, alongside the running server; WAL allows it). */
export function queryServer<T>(databaseFile: string, sql: string, ...args: unknown[]): T[] {
  const db = new Database(databaseFile, { readonly: true });
  try {
    return db.prepare(sql).all(...args) as T[];
  } finally {
    db.close();
  }
}

/** Polls the server's database until `ok` holds or the time is up; returns the last rows read. */
export async function waitForRows<T>(databaseFile: string, sql: string, args: unknown[], ok: (rows: T[]) => boolean, timeout = 45_000): Promise<T[]> {
  const deadline = Date.now() + timeout;
  for (;;) {
    const rows = queryServer<T>(databaseFile, sql, ...args);
    if (ok(rows) || Date.now() > deadline) return rows;
    await new Promise((r) => setTimeout(r, 250));
  }
}

/**
 * SQL condition on `bags` for a bag whose check sheet offers the one-tap "All good": in the cold, not past its
 * latest pull, nothing wrong found yet. The demo's bags and checks are drawn at random, so tests pick by this.
 */
export const ONE_TAP_BAG = `bags.start_date IS NOT NULL AND bags.pulled_on IS NULL AND bags.discarded_on IS NULL AND bags.sown_on IS NULL
  AND bags.deleted_at IS NULL AND (bags.window_end IS NULL OR bags.window_end >= date('now'))
  AND NOT EXISTS (SELECT 1 FROM checks c WHERE c.bag_id = bags.id AND (c.mould <> 'clean' OR c.sprouts <> 'none' OR c.moisture <> 'damp'))`;
