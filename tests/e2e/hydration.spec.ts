import { expect, test } from "@playwright/test";
import { countRenders, demoCaseId, hydrated, rendersIn, signIn } from "./helpers";

// What a results page does as it hydrates, beside what it shows: the parts that do not change are
// not rendered again (a second render of a table is main-thread time before the page can answer a
// click), and the data a page fetches after it shows is asked for once it answers input, not from
// the commit that hydrates it. Properties, not times: no test here waits for or measures a duration.

test("the envelope page draws the V–n points table once: the form's second render as it hydrates leaves it alone", async ({ page }) => {
  await countRenders(page, { vnTable: '[data-table="vn-points.csv"]' });
  await signIn(page, "engineer");
  await page.goto(`/cases/${await demoCaseId(page)}/envelope`);
  await hydrated(page);
  // Everything drawn after the page answers input is there: the grid's rows and the diagram.
  await expect(page.getByLabel("Case, row 1", { exact: true })).toBeVisible();
  await expect(page.getByRole("figure", { name: "V–n diagram" }).getByRole("img", { name: "V–n diagram" })).toBeVisible({ timeout: 60_000 });
  expect(await rendersIn(page, "vnTable")).toBe(1);
});

test("the distribution page's flagged-cases table is not drawn again by the page's fetches or the measuring of its rows", async ({ page }) => {
  await countRenders(page, { flagged: '[data-testid="flagged-cases"]' });
  await signIn(page, "engineer");
  await page.goto(`/cases/${await demoCaseId(page)}/distribution`);
  await hydrated(page);
  await expect(page.getByRole("table", { name: "Flagged cases and their dispositions" }).getByRole("row")).not.toHaveCount(0);
  // The shown case's distribution, the methods compared and the rule sensitivity have all arrived.
  await expect(page.getByRole("figure", { name: "Spanwise loading" }).getByRole("img", { name: "Spanwise loading" })).toBeVisible({ timeout: 60_000 });
  await expect(page.getByRole("table", { name: "Root loads by spanwise method" })).toBeVisible({ timeout: 60_000 });
  await expect(page.getByRole("table", { name: "Root loads of the critical cases under each compressibility rule" })).toBeVisible({ timeout: 120_000 });
  // Drawn as the page hydrates, and once more when the virtualiser first takes note of the window it
  // drew (its own bookkeeping, in the same task); not at each of the page's fetches.
  expect(await rendersIn(page, "flagged")).toBeLessThanOrEqual(2);
});

for (const { step, shows } of [
  { step: "distribution", shows: "Root loads by spanwise method" },
  { step: "loads", shows: "Root loads of every case" },
]) {
  test(`the ${step} page asks for its data once it has hydrated, not while`, async ({ page }) => {
    // The router's fetchers at the moment root.tsx marks the page hydrated (its effect runs after every other of that commit).
    await page.addInitScript(() => {
      new MutationObserver((_, observer) => {
        if (!document.documentElement.dataset.hydrated) return;
        observer.disconnect();
        const w = window as unknown as { __reactRouterDataRouter?: { state: { fetchers: Map<string, unknown> } }; __fetchersAtHydration: number };
        w.__fetchersAtHydration = w.__reactRouterDataRouter ? w.__reactRouterDataRouter.state.fetchers.size : -1;
      }).observe(document, { attributes: true, subtree: true, attributeFilter: ["data-hydrated"] });
    });
    await signIn(page, "engineer");
    await page.goto(`/cases/${await demoCaseId(page)}/${step}`);
    await hydrated(page);
    expect(await page.evaluate(() => (window as unknown as { __fetchersAtHydration: number }).__fetchersAtHydration)).toBe(0);
    await expect(page.getByRole("table", { name: shows })).toBeVisible({ timeout: 60_000 });
  });
}
