import { expect, test } from "@playwright/test";
import { RULE_LABELS } from "../../app/domain/vocabulary";
import { copyOfDemoCase, hydrated, signIn } from "./helpers";

// The distribution page's rule sensitivity is solved by the job worker: the page shows how far it
// has got, then the figures. The page's second and later asks are held until the progress has been
// seen, so that a fast worker cannot make the progress vanish before the test reads it.

test("the distribution page shows the rule sensitivity's progress, then the critical cases under each rule", async ({ page }) => {
  await signIn(page, "engineer");
  // A copy of its own: nothing is stored for its inputs yet, so the first answer is the progress.
  const caseId = await copyOfDemoCase(page, "TN-SENS-E2E");
  let asks = 0;
  let release!: () => void;
  const progressSeen = new Promise<void>((r) => (release = r));
  await page.route("**/api/cases/*/rule-sensitivity*", async (route) => {
    if (++asks > 1) await progressSeen;
    await route.continue();
  });

  await page.goto(`/cases/${caseId}/distribution`);
  await hydrated(page);
  const panel = page.locator("section", { has: page.getByRole("heading", { name: "Sensitivity to the compressibility rule" }) });
  await expect(panel.getByRole("progressbar", { name: "Critical cases solved under each rule" })).toBeVisible();
  await expect(panel.getByRole("status")).toContainText("Solving the critical cases under each rule: waiting for a background worker.");
  release();

  const table = panel.getByRole("table", { name: "Root loads of the critical cases under each compressibility rule" });
  await expect(table).toBeVisible({ timeout: 60_000 });
  await expect(panel.getByRole("progressbar")).toHaveCount(0);
  // Every rule by name, the case's own marked, and a spread row per critical case.
  for (const label of Object.values(RULE_LABELS)) await expect(table.getByRole("cell").filter({ hasText: label }).first()).toBeVisible();
  await expect(table.getByText("(this case's rule)").first()).toBeVisible();
  await expect(table.getByRole("cell", { name: "Spread (largest − smallest)" }).first()).toBeVisible();
  expect(asks).toBeGreaterThan(1);
});
