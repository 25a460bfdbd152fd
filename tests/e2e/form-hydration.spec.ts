import { expect, test, type Page } from "@playwright/test";
import { copyOfDemoCase, countRenders, demoCaseId, hydrated, rendersIn, signIn } from "./helpers";

// What the step forms (basis, planform, sections, masses) do as they hydrate, beside what they show:
// the form is rendered once (a second render of it before the page answers a click is main-thread
// time), zod and the step schemas are loaded once the form is used, not as the page loads, and the
// planform page posts no preview of the planform it was drawn with. Properties, not times: no test
// here waits for or measures a duration.

for (const step of ["basis", "planform", "sections", "masses"]) {
  test(`the ${step} form renders once as the page hydrates`, async ({ page }) => {
    // The save bar renders whenever the form does (it is not memoised); the grids' own second render
    // (the virtualiser's bookkeeping) is theirs alone and not counted here.
    await countRenders(page, { form: '[data-testid="step-save-bar"]' });
    await signIn(page, "engineer");
    await page.goto(`/cases/${await demoCaseId(page)}/${step}`);
    await hydrated(page);
    await afterIdle(page);
    await expect(page.getByTestId("step-save-bar")).toBeVisible();
    expect(await rendersIn(page, "form")).toBe(1);
  });
}

/** Resolves once the page has had its idle time after hydration (its own idle callbacks, queued first, have run) and its requests are done. */
async function afterIdle(page: Page) {
  await page.evaluate(() => new Promise<void>((resolve) => requestIdleCallback(() => resolve(), { timeout: 1000 })));
  await page.waitForLoadState("networkidle");
}

/** The form schemas' modules (a route's `*.schema` chunk, and the shared zod and step-schema chunk). */
const isSchemaModule = (url: string) => /\/assets\/([\w-]+\.schema|schemas)-[\w-]+\.js$/.test(url);

// Each step with a field its schema checks: a value refused, and what the form says.
const CHECKS = [
  { step: "basis", field: "Max take-off [kg]", typed: "heavy", says: "Maximum design take-off weight must be a number" },
  { step: "planform", field: "Reference axis at root [chord fraction]", typed: "abc", says: "Reference axis at the root must be a number" },
  { step: "sections", field: "Δα0L [°]", typed: "abc", says: null },
  { step: "masses", field: "Wing–body Cm increment at zero lift", typed: "abc", says: "Wing–body Cm increment must be a number" },
] as const;

for (const { step, field, typed, says } of CHECKS) {
  test(`the ${step} page loads its form's schema once a field takes the focus, not as it loads`, async ({ page }) => {
    await signIn(page, "engineer"); // the sign-in page checks its form with zod as it loads
    const path = `/cases/${await demoCaseId(page)}/${step}`;
    const schemaRequests: string[] = [];
    page.on("request", (r) => void (isSchemaModule(r.url()) && schemaRequests.push(r.url())));
    await page.goto(path);
    await hydrated(page);
    await afterIdle(page);
    expect(schemaRequests).toEqual([]);
    const input = page.getByLabel(field, { exact: true });
    await input.focus();
    await expect.poll(() => schemaRequests.length).toBeGreaterThan(0);
    if (!says) return;
    await input.fill(typed);
    await input.blur();
    await expect(page.getByText(says)).toBeVisible();
  });
}

test("the planform page posts no preview of the planform it was drawn with, and draws a changed chord", async ({ page }) => {
  await signIn(page, "engineer");
  const path = `/cases/${await copyOfDemoCase(page, "E2E-PLANFORM-PREVIEW")}/planform`;
  const previews: string[] = [];
  page.on("request", (r) => void (r.method() === "POST" && r.url().includes("/api/planform-preview") && previews.push(r.postData() ?? "")));
  await page.goto(path);
  await hydrated(page);
  await afterIdle(page);
  expect(previews).toEqual([]);
  const area = page.getByRole("row", { name: /^Area S/ });
  const savedArea = await area.textContent();
  const chord = page.getByLabel("Chord [m], row 1", { exact: true });
  await chord.fill(String(Number(await chord.inputValue()) * 2));
  // The drawing and the geometry follow what is typed.
  await expect(area).not.toHaveText(savedArea ?? "");
  expect(previews.length).toBeGreaterThan(0);
});
