// Browser-side helpers for Playwright specs.
import { expect, type Page } from "@playwright/test";
import { DEMO_PASSWORD, DEMO_USERS } from "../../db/seed/demo-users";

export async function signInAs(page: Page, key: string) {
  const user = DEMO_USERS.find((u) => u.key === key);
  if (!user) throw new Error(`No demo user ${key}`);
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(user.email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText(`Signed in as ${user.name}`)).toBeVisible();
  return user;
}

// Waits until the service worker controls the page and has stored the given field pages.
export async function waitForOfflineReady(page: Page, ...paths: string[]) {
  // Installing precaches every built script; on a loaded 2-core machine that can take a while.
  await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, null, { timeout: 40_000 });
  await expect
    .poll(
      () =>
        page.evaluate(async (ps) => {
          const cache = await caches.open("field-pages");
          const found = await Promise.all(ps.map((p) => cache.match(p)));
          return found.every(Boolean);
        }, paths),
      { timeout: 20_000 },
    )
    .toBe(true);
}

// The path of every URL held in any Cache Storage cache of the page's origin.
export async function cachedPaths(page: Page): Promise<string[]> {
  return page.evaluate(async () => {
    const paths: string[] = [];
    for (const name of await caches.keys()) {
      const cache = await caches.open(name);
      for (const req of await cache.keys()) paths.push(new URL(req.url).pathname);
    }
    return paths;
  });
}
