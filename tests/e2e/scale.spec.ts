import { expect, test, type Page } from "@playwright/test";
import { DEMO_USERS } from "../../app/demo/scenario";

// A case file at the scale real programmes carry: 100 000 load cases. Behaviour, not timing: the
// envelope page sends a window of rows, not all of them, and a row far down is shown, edited,
// saved and read back as stored.

const ORIGIN = process.env.E2E_ORIGIN!;
const CASES = 100_000;
const ROW = 87_654;
/** Mach number of case i (0-based), with two decimals as it is shown. */
const machOf = (i: number) => Number((0.2 + (i % 10) * 0.03).toFixed(2));

async function signIn(page: Page) {
  const u = DEMO_USERS.find((d) => d.label === "engineer")!;
  await page.goto("/login");
  await page.getByLabel("E-mail", { exact: true }).fill(u.email);
  await page.getByLabel("Password").fill(u.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL("/cases");
}

test.setTimeout(300_000);

test("the envelope of a 100 000-case file shows a window of rows, and a row far down is edited and saved", async ({ page }) => {
  await signIn(page);
  // The demo case, exported and imported again with 100 000 trimmed load cases.
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string; programme: { id: string } }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  const doc = (await (await page.request.get(`/api/v1/cases/${demo.id}/export`)).json()) as { cases: unknown[]; method: Record<string, unknown> };
  doc.cases = Array.from({ length: CASES }, (_, i) => ({ id: `S${i + 1}`, mach: machOf(i), altitude: 1000 * (i % 5), weight: 30000, nz: 1 + (i % 7) * 0.25 }));
  doc.method = { ...doc.method, output: "summary" };
  const imported = await page.request.post("/api/v1/cases/import", { data: { programmeId: demo.programme.id, reference: "TN-SCALE-100K", case: doc }, headers: { Origin: ORIGIN }, timeout: 120_000 });
  expect(imported.status(), await imported.text()).toBe(201);
  const caseId = ((await imported.json()) as { id: string }).id;

  const page1 = await page.goto(`/cases/${caseId}/envelope`, { timeout: 120_000 });
  // The page carries the first rows only (well under 1 MB of HTML for 100 000 cases)…
  expect((await page1!.body()).length).toBeLessThan(1_000_000);
  const grid = page.getByTestId("load-case-window");
  // The page's scripts run (the grid scrolls and fetches with them).
  await expect(page.locator("html[data-hydrated]")).toHaveCount(1);
  await expect(page.getByRole("heading", { name: "Load cases (100,000)" })).toBeVisible();
  await expect(grid.getByLabel("Mach, row 1", { exact: true })).toHaveValue("0.2");
  // …and the browser holds inputs for the rows in view, not for every case.
  expect(await grid.locator("input").count()).toBeLessThan(1000);

  // A row far down: fetched when shown, edited, saved with only that row sent.
  await page.getByLabel("Go to row").fill(String(ROW));
  await page.getByRole("button", { name: "Show", exact: true }).click();
  const mach = grid.getByLabel(`Mach, row ${ROW}`, { exact: true });
  await expect(mach).toHaveValue(String(machOf(ROW - 1)));
  await expect(grid.getByLabel(`Case, row ${ROW}`, { exact: true })).toHaveValue(`S${ROW}`);
  await mach.fill("0.456");
  // Scrolled away and back, the edit is still there (kept while out of view).
  await page.getByLabel("Go to row").fill("1");
  await page.getByRole("button", { name: "Show", exact: true }).click();
  await expect(grid.getByLabel("Mach, row 1", { exact: true })).toBeVisible();
  await page.getByLabel("Go to row").fill(String(ROW));
  await page.getByRole("button", { name: "Show", exact: true }).click();
  await expect(mach).toHaveValue("0.456");
  await page.getByRole("button", { name: "Save 1 changed row" }).click();
  await expect(page.getByRole("status").filter({ hasText: /Saved as revision \d+/ })).toBeVisible({ timeout: 120_000 });

  // Read back: in the page after a reload, and in the stored case file.
  await page.reload({ timeout: 120_000 });
  await expect(page.locator("html[data-hydrated]")).toHaveCount(1);
  await page.getByLabel("Go to row").fill(String(ROW));
  await page.getByRole("button", { name: "Show", exact: true }).click();
  await expect(grid.getByLabel(`Mach, row ${ROW}`, { exact: true })).toHaveValue("0.456");
  const stored = (await (await page.request.get(`/api/v1/cases/${caseId}/export`)).json()) as { cases: { id: string; mach: number }[] };
  expect(stored.cases).toHaveLength(CASES);
  expect(stored.cases[ROW - 1]).toMatchObject({ id: `S${ROW}`, mach: 0.456 });
  expect(stored.cases[ROW - 2]!.mach).toBe(machOf(ROW - 2));
});
