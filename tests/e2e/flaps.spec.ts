import { expect, test } from "@playwright/test";
import { DEMO_CASE_INPUTS } from "../../app/demo/scenario";
import { caseStep, hydrated, shot, signIn } from "./helpers";

// The demo case's basis gives VF and its sections the flapped span: the V–n page shows the flaps-extended
// points beside every other generated point (the VB, VC and VD gusts among them), each with its rule.
test("the V–n page of the demo case shows the flaps-extended points and every other generated point, with their rules", async ({ page }) => {
  await signIn(page);
  await page.goto("/cases");
  await page.getByRole("link", { name: "TN-WL-001" }).first().click();
  await caseStep(page, /Sections/).click();
  await expect(page.getByRole("heading", { name: "Flaps extended" })).toBeVisible();
  const f = DEMO_CASE_INPUTS.sections.flaps;
  await expect(page.getByLabel("From y [m]")).toHaveValue(String(f.yFrom));
  await expect(page.getByLabel("Δα0L [°]")).toHaveValue(String(f.dAlphaL0));

  await caseStep(page, /Envelope/).click();
  await hydrated(page);
  await expect(page.getByRole("heading", { name: "V–n diagram" })).toBeVisible();
  const points = page.getByRole("table", { name: /^V–n points/ });
  await expect(points).toBeVisible();
  for (const name of ["A", "D", "E", "F", "H", "gust+VB", "gust-VB", "gust+VC", "gust-VC", "gust+VD", "gust-VD", "flaps-A", "flaps-VF", "flaps-gust+VF", "flaps-gust-VF"]) {
    await expect(points.getByRole("row").filter({ has: page.getByRole("cell", { name, exact: true }) })).toHaveCount(1);
  }
  await expect(points.getByRole("row").filter({ hasText: "flaps-VF" })).toContainText("14 CFR 23.345(a)(1)");
  await expect(page.getByText(/Flaps extended \(points flaps-…, solved on the flapped wing/)).toBeVisible();
  // Another weight and altitude has its own flaps points.
  await page.getByLabel("Weight and altitude").selectOption({ index: 5 });
  await expect(points).toContainText("flaps-gust+VF");
  // The generated flaps cases carry the flag in the case grid.
  await expect(page.getByRole("columnheader", { name: "Flaps" })).toBeVisible();
  await shot(page, "flaps-vn");
});
