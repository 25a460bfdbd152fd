import { expect, test, type Page } from "@playwright/test";
import { DEMO_CASE_INPUTS } from "../../app/demo/scenario";
import { copyOfDemoCase, exported, holdReloads, hydrated, signIn, typeDemoBasis } from "./helpers";

// Values typed into a step form must be the values saved: at every moment a person can type, and
// with the page telling the truth about which revision it shows.

const rail = (page: Page, step: RegExp) => page.getByRole("navigation", { name: "Steps" }).getByRole("link", { name: step });
const saved = (page: Page, revision: number) => page.getByRole("status").filter({ hasText: `Saved as revision ${revision}.` });

test("after generating cases the page shows the new revision with its confirmation, and a fix typed then is the one saved", async ({ page }) => {
  test.setTimeout(240_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-EDIT-1", { oneCase: true });
  await typeDemoBasis(page, caseId);
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  await expect(rail(page, /Envelope/)).toContainText("rev. 1");

  // The page re-reads its data after the post; held back here, as a busy server holds it.
  const reload = await holdReloads(page, "envelope");
  const answered = page.waitForResponse((r) => r.request().method() === "POST" && new URL(r.url()).pathname.endsWith("/envelope.data"));
  await page.getByRole("button", { name: "Generate cases from the basis rules" }).click();
  await answered;
  // The answer is in, the new data are not: nothing can be typed over the rows about to be replaced,
  // and no confirmation stands beside the old revision.
  await expect(page.locator("#cases-0-3")).toBeDisabled();
  await expect(saved(page, 2)).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Saving…" })).toBeVisible();
  reload.release();

  // The confirmation, the rail and the save bar agree at once.
  await expect(saved(page, 2)).toBeVisible({ timeout: 60_000 });
  await expect(rail(page, /Envelope/)).toContainText("rev. 2");
  await expect(page.getByText("Revision 2 · saving makes revision 3")).toBeVisible();

  // A fix typed right after the confirmation reaches the stored case.
  const id = await page.locator("#cases-0-0").inputValue();
  await page.locator("#cases-0-3").fill("1234");
  await page.getByRole("button", { name: "Save envelope" }).click();
  await expect(saved(page, 3)).toBeVisible({ timeout: 60_000 });
  await expect(rail(page, /Envelope/)).toContainText("rev. 3");
  await reload.stop();
  const stored = (await exported(page, caseId)).cases.find((c) => c.id === id)!;
  expect(stored.altitude).toBe(1234);

  // Enter in a field of the form saves what was typed; it never regenerates the cases over it.
  await page.locator("#cases-0-3").fill("1500");
  await page.getByLabel("Output stations per semispan").press("Enter");
  await expect(saved(page, 4)).toBeVisible({ timeout: 60_000 });
  expect((await exported(page, caseId)).cases.find((c) => c.id === id)!.altitude).toBe(1500);
});

test("a save with no change makes no new revision, and says so", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-EDIT-2");
  await typeDemoBasis(page, caseId);
  await expect(rail(page, /Basis/)).toContainText("rev. 1");
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Nothing changed: revision 1 is kept as it was, and so are its approvals." })).toBeVisible();
  await expect(rail(page, /Basis/)).toContainText("rev. 1");
  await expect(page.getByText("Revision 1 · saving makes revision 2")).toBeVisible();
});

test("the basis page shows its saved values before its scripts run, and what is typed then is saved", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-EDIT-3");
  await typeDemoBasis(page, caseId);
  let release!: () => void;
  const held = new Promise<void>((r) => (release = r));
  await page.route("**/assets/*.js", async (route) => {
    await held;
    await route.continue();
  });
  await page.goto(`/cases/${caseId}/basis`, { waitUntil: "domcontentloaded" });
  await expect(page.locator("html[data-hydrated]")).toHaveCount(0);
  // The server-rendered form holds the saved values, as a person reads them before typing.
  await expect(page.getByLabel("Max take-off [kg]")).toHaveValue("6350");
  await expect(page.getByLabel("VD [m/s]")).toHaveValue(String(DEMO_CASE_INPUTS.basis.vd));
  const typed = String(DEMO_CASE_INPUTS.basis.vd + 5);
  await page.getByLabel("VD [m/s]").fill(typed);
  release();
  await hydrated(page);
  await page.unroute("**/assets/*.js");
  await expect(page.getByLabel("VD [m/s]")).toHaveValue(typed);
  await expect(page.getByLabel("Max take-off [kg]")).toHaveValue("6350");
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(saved(page, 2)).toBeVisible({ timeout: 60_000 });
  await page.reload();
  await expect(page.getByLabel("VD [m/s]")).toHaveValue(typed);
});

test("a grid message goes once its cell holds another value, typed or pasted", async ({ page }) => {
  test.setTimeout(180_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-EDIT-4");
  await page.goto(`/cases/${caseId}/planform`);
  await hydrated(page);
  const cell = (r: number, c: number) => page.locator(`#stations-${r}-${c}`);
  // The server's message about a cell goes when the cell is changed, before the next save (the
  // order of the stations is checked on the server only).
  const outOfOrder = "Station 3: y must be greater than the station before (y increases from root to tip)";
  await cell(2, 0).fill("3");
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(page.getByText(outOfOrder, { exact: true })).toBeVisible();
  await cell(2, 0).fill("8.7");
  await expect(page.getByText(outOfOrder, { exact: true })).toHaveCount(0);
  await expect(cell(2, 0)).toHaveAttribute("aria-invalid", "false");

  // The browser's own messages about an empty row go when a row is pasted into it.
  await page.getByRole("button", { name: "Add row" }).click();
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(page.getByText("Chord is required")).toBeVisible();
  await cell(3, 0).evaluate((el) => {
    const data = new DataTransfer();
    data.setData("text/plain", "9.5\t0.62\t0.8\t-3");
    el.dispatchEvent(new ClipboardEvent("paste", { clipboardData: data, bubbles: true, cancelable: true }));
  });
  await expect(cell(3, 2)).toHaveValue("0.8");
  await expect(page.getByText("Chord is required")).toHaveCount(0);
  await expect(page.getByText("Leading edge x is required")).toHaveCount(0);
});

test("a negative weight is refused as not positive, naming the field, and nothing is saved", async ({ page }) => {
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-EDIT-5");
  await typeDemoBasis(page, caseId);
  await page.reload();
  await hydrated(page);
  await page.getByLabel("Max take-off [kg]").fill("-3200");
  await page.getByRole("button", { name: "Save basis" }).click();
  const field = page.getByLabel("Max take-off [kg]");
  await expect(page.getByText("Maximum design take-off weight must be positive", { exact: true })).toBeVisible();
  await expect(field).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByText(/must be a number/)).toHaveCount(0);
  await expect(rail(page, /Basis/)).toContainText("rev. 1");
  await page.goto(`/cases/${caseId}/basis`);
  await expect(page.getByLabel("Max take-off [kg]")).toHaveValue(String(DEMO_CASE_INPUTS.basis.mtow));
});
