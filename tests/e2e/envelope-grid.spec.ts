import { expect, test, type Page } from "@playwright/test";
import { copyOfDemoCase, demoCaseId, exported, hydrated, shot, signIn } from "./helpers";

// The envelope's load-case grid draws only the rows in view (the demo's case file has far more rows
// than fit): what is typed into any row, drawn or scrolled away, is what is saved, and a post sent
// before the page's scripts ran (with only the rows the server drew) saves nothing.

const saved = (page: Page) => page.getByRole("status").filter({ hasText: /Saved as revision \d+\./ });

test("rows scrolled into view are edited and saved with every row never shown, unchanged", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-GRID-1");
  const before = await exported(page, caseId);
  const last = before.cases.length - 1;
  expect(last).toBeGreaterThan(100);

  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  await expect(page.getByText(`Load cases (${before.cases.length})`)).toBeVisible();
  // The first rows are drawn, the last one is not until it is scrolled to.
  await expect(page.locator("#cases-0-3")).toBeVisible();
  await expect(page.locator(`#cases-${last}-3`)).toHaveCount(0);
  await page.locator("#cases-0-3").fill("1111");
  await page.getByTestId("cases-window").evaluate((el) => el.scrollTo(0, el.scrollHeight));
  await page.locator(`#cases-${last}-3`).fill("2222");
  // Scrolled back to the top, the first row still holds what was typed into it.
  await page.getByTestId("cases-window").evaluate((el) => el.scrollTo(0, 0));
  await expect(page.locator("#cases-0-3")).toHaveValue("1111");
  // The arrow key moves down out of the drawn rows: the row below is brought into view and focused.
  await page.getByTestId("cases-window").evaluate((el) => el.scrollTo(0, el.scrollHeight));
  await page.locator(`#cases-${last - 1}-3`).press("ArrowDown");
  await expect(page.locator(`#cases-${last}-3`)).toBeFocused();
  await shot(page, "envelope-grid-window");

  await page.getByRole("button", { name: "Save envelope" }).click();
  await expect(saved(page)).toBeVisible({ timeout: 60_000 });
  const after = await exported(page, caseId);
  expect(after.cases.map((c) => c.id)).toEqual(before.cases.map((c) => c.id));
  expect(after.cases[0]!.altitude).toBe(1111);
  expect(after.cases[last]!.altitude).toBe(2222);
  // Every other row, never drawn in this browser, is stored as it was (to the rounding of the
  // display units a whole-grid save goes through: a weight shown in kg is stored in N).
  after.cases.slice(1, last).forEach((row, i) => sameCase(row, before.cases[i + 1]!));
});

function sameCase(stored: Record<string, unknown>, expected: Record<string, unknown>) {
  expect(Object.keys(stored).sort()).toEqual(Object.keys(expected).sort());
  for (const [key, value] of Object.entries(expected)) {
    if (typeof value === "number") expect(Math.abs((stored[key] as number) - value), `${String(expected.id)}.${key}`).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(value)));
    else expect(stored[key], `${String(expected.id)}.${key}`).toEqual(value);
  }
}

test("a save posted before the page's scripts ran, with only the rows the server drew, is refused and writes nothing", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-GRID-2");
  const before = await exported(page, caseId);
  await page.route("**/assets/*.js", () => {
    // The scripts never arrive: the form is the server's HTML alone.
  });
  await page.goto(`/cases/${caseId}/envelope`, { waitUntil: "domcontentloaded" });
  await expect(page.locator("html[data-hydrated]")).toHaveCount(0);
  await page.getByRole("button", { name: "Save envelope" }).click();
  await expect(page.getByText(new RegExp(`The page sent \\d+ of its ${before.cases.length} load cases \\(it had not finished loading\\); nothing was saved: save again\\.`))).toBeVisible();
  await page.unroute("**/assets/*.js");
  const after = await exported(page, caseId);
  expect(after.cases).toEqual(before.cases);
});

// The rows of the long grid are drawn once the page answers input, not by the server nor while the
// page hydrates (some 400 inputs that held back its first answer); then the window scrolls through every row.
test("the long grid's rows are drawn once the page answers input, in a window of the height of every row", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  const caseId = list.cases.find((c) => c.reference === "TN-WL-001")!.id;
  const html = await (await page.request.get(`/cases/${caseId}/envelope`)).text();
  expect(html).toContain('data-testid="cases-window"');
  expect(html).not.toContain('id="cases-0-3"');

  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  const cell = page.getByLabel("Altitude [m], row 1", { exact: true });
  await expect(cell).toBeVisible();
  await expect(page.getByTestId("cases-window")).not.toHaveAttribute("aria-busy", "true");
  // Every row of the file has its height in the window (rows of at least 30 px).
  const rows = (await exported(page, caseId)).cases.length;
  expect(rows).toBeGreaterThan(100);
  expect(await page.getByTestId("cases-window").evaluate((el) => el.scrollHeight)).toBeGreaterThan(rows * 30);
});

// One commit drawing every row in view (some 1 100 elements, their fields registered, the page laid out
// again) kept a click that came meanwhile waiting for all of it: the rows come a few at a time instead.
test("the long grid fills its window a few rows at a time, never more than 8 rows in one task", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await demoCaseId(page);
  await page.addInitScript(() => {
    const w = window as unknown as { __gridRows: number[] };
    w.__gridRows = [];
    // Every batch of mutations a task made, as the rows of the grid it added.
    new MutationObserver((records) => {
      const rows = records.flatMap((r) => [...r.addedNodes]).filter((n) => n instanceof HTMLTableRowElement && n.hasAttribute("data-index") && n.closest('[data-testid="cases-window"]')).length;
      if (rows) w.__gridRows.push(rows);
    }).observe(document, { childList: true, subtree: true });
  });
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  await expect(page.getByTestId("cases-window")).not.toHaveAttribute("aria-busy", "true");
  await expect(page.getByLabel("Altitude [m], row 16", { exact: true })).toBeAttached();
  const added = await page.evaluate(() => (window as unknown as { __gridRows: number[] }).__gridRows);
  expect(added.reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(16);
  expect(Math.max(...added), `rows added per task: ${added.join(", ")}`).toBeLessThanOrEqual(8);
});

// A case file above the whole-grid limit (500 cases) is shown as a window on the stored rows. Its rows
// in view were drawn as the page hydrated, in one commit; they now come once the page answers input,
// a few at a time, as the long grid's do.
test("the window on a large case file fills a few rows at a time once the page answers input, never more than 8 rows in one task", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await largeCaseFile(page, "E2E-GRID-WINDOW", "W");
  await page.addInitScript(() => {
    const w = window as unknown as { __windowRows: number[] };
    w.__windowRows = [];
    new MutationObserver((records) => {
      const rows = records.flatMap((r) => [...r.addedNodes]).filter((n) => n instanceof HTMLTableRowElement && n.hasAttribute("aria-rowindex") && n.closest('[data-testid="load-case-window"]')).length;
      if (rows) w.__windowRows.push(rows);
    }).observe(document, { childList: true, subtree: true });
  });
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  const grid = page.getByTestId("load-case-window");
  await expect(grid).not.toHaveAttribute("aria-busy", "true");
  await expect(grid.getByLabel("Case, row 16", { exact: true })).toHaveValue("W16");
  const added = await page.evaluate(() => (window as unknown as { __windowRows: number[] }).__windowRows);
  expect(added.reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(16);
  expect(Math.max(...added), `rows added per task: ${added.join(", ")}`).toBeLessThanOrEqual(8);
});

// "Go to row" pressed as soon as the page answers input, before the browser's first idle moment has
// drawn the window: the row asked for is shown once the window is drawn (it was lost, and the window
// stayed at row 1). The page's idle callbacks are held until the jump has been asked for.
test("a row asked for before the window on a large case file is first drawn is shown once it is", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await largeCaseFile(page, "E2E-GRID-JUMP", "J");
  await page.addInitScript(() => {
    // requestIdleCallback held: the callbacks asked for wait in a queue until __releaseIdle(), then
    // go to the browser's own, as does every later one (with a time limit, as the page's own calls
    // have: headless Chromium, drawing no frames, may have no idle moment to run them in).
    const w = window as unknown as { requestIdleCallback: typeof requestIdleCallback; cancelIdleCallback: typeof cancelIdleCallback; __releaseIdle: () => void };
    const own = { request: w.requestIdleCallback.bind(window), cancel: w.cancelIdleCallback.bind(window) };
    const held = new Map<number, IdleRequestCallback>();
    let next = 1_000_000;
    w.requestIdleCallback = (cb) => (held.set(next, cb), next++);
    w.cancelIdleCallback = (id) => (held.delete(id) ? undefined : own.cancel(id));
    w.__releaseIdle = () => {
      w.requestIdleCallback = own.request;
      w.cancelIdleCallback = own.cancel;
      for (const cb of held.values()) own.request(cb, { timeout: 100 });
      held.clear();
    };
  });
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  const grid = page.getByTestId("load-case-window");
  await expect(grid).toHaveAttribute("aria-busy", "true");
  await expect(grid.locator("tr[aria-rowindex]")).toHaveCount(0);
  await page.getByLabel("Go to row").fill("550");
  await page.getByRole("button", { name: "Show", exact: true }).click();
  await page.evaluate(() => (window as unknown as { __releaseIdle: () => void }).__releaseIdle());
  await expect(grid.getByLabel("Case, row 550", { exact: true })).toHaveValue("J550");
  await expect(grid.getByLabel("Case, row 1", { exact: true })).toHaveCount(0);
});

/** A copy of the demo case with 600 load cases (over the whole grid's 500: the page shows a window on them), ids `${prefix}1`… */
async function largeCaseFile(page: Page, reference: string, prefix: string): Promise<string> {
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string; programme: { id: string } }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  const doc = (await (await page.request.get(`/api/v1/cases/${demo.id}/export`)).json()) as { cases: unknown[] };
  doc.cases = Array.from({ length: 600 }, (_, i) => ({ id: `${prefix}${i + 1}`, mach: 0.3, altitude: 1000 * (i % 5), weight: 30000, nz: 1 + (i % 7) * 0.25 }));
  const imported = await page.request.post("/api/v1/cases/import", { data: { programmeId: demo.programme.id, reference, case: doc }, headers: { Origin: new URL(page.url()).origin } });
  expect(imported.status(), await imported.text()).toBe(201);
  return ((await imported.json()) as { id: string }).id;
}
