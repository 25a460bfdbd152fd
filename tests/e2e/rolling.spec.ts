import fs from "node:fs";
import { expect, test } from "@playwright/test";
import { DEMO_CASE_INPUTS } from "../../app/demo/scenario";
import { caseStep, hydrated, shot, signIn } from "./helpers";

/** The text of every label in an SVG file (a chart saved through its own "Save SVG"). */
const svgTexts = (svg: string) => [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!.trim()).filter(Boolean);

// The demo wing has an aileron: the V–n page shows the rolling points beside every other generated point,
// and the loads page shows both sides of a rolling case and names the side of each envelope extreme.
test("the V–n page shows the rolling points and the loads page both sides of a rolling case", async ({ page }) => {
  test.setTimeout(300_000);
  await signIn(page);
  await page.goto("/cases");
  await page.getByRole("link", { name: "TN-WL-001" }).first().click();
  await caseStep(page, /Sections/).click();
  await expect(page.getByRole("heading", { name: "Aileron" })).toBeVisible();
  const a = DEMO_CASE_INPUTS.sections.aileron;
  await expect(page.getByLabel("Aileron inner end y [m]")).toHaveValue(String(a.yFrom));
  await expect(page.getByLabel("Deflection at VA [°]")).toHaveValue(String(a.deltaAtVa));

  await caseStep(page, /Envelope/).click();
  await hydrated(page);
  const points = page.getByRole("table", { name: /^V–n points/ });
  await expect(points).toBeVisible();
  for (const name of ["A", "D", "E", "F", "H", "gust+VB", "gust-VB", "gust+VC", "gust-VC", "gust+VD", "gust-VD", "flaps-A", "flaps-VF", "flaps-gust+VF", "flaps-gust-VF", "unsym-A", "roll-VA", "roll-VC", "roll-VD"]) {
    await expect(points.getByRole("row").filter({ has: page.getByRole("cell", { name, exact: true }) })).toHaveCount(1);
  }
  await expect(points.getByRole("row").filter({ hasText: "unsym-A" })).toContainText("14 CFR 23.349(a)");
  await expect(points.getByRole("row").filter({ hasText: "roll-VC" })).toContainText("14 CFR 23.455");
  await expect(page.getByText(/Rolling conditions \(diamonds, kind “rolling”\)/)).toBeVisible();
  await shot(page, "rolling-vn");

  await caseStep(page, /Loads/).click();
  await hydrated(page);
  const picker = page.getByLabel("Case shown on the plots");
  await expect(picker).toBeVisible({ timeout: 180_000 });
  await picker.selectOption({ value: "W1-roll-VC" });
  // The case first shown may itself be a rolling case (the demo's critical one is): wait for the chosen one.
  await expect(page.getByText("Both sides of rolling case W1-roll-VC", { exact: true })).toBeVisible({ timeout: 120_000 });
  const sides = page.getByRole("table", { name: "Root loads of both sides of the rolling case" });
  await expect(sides).toBeVisible({ timeout: 120_000 });
  await expect(sides.getByRole("row").filter({ hasText: "Loaded side" })).toContainText("° down");
  await expect(sides.getByRole("row").filter({ hasText: "Other side" })).toContainText("° up");
  // The charts draw both sides: read the shear chart's legend through its own "Save SVG".
  const figure = page.getByRole("figure", { name: "Shear force along the span" });
  await expect(figure.getByRole("img", { name: "Shear force along the span" })).toBeVisible();
  const download = page.waitForEvent("download");
  await figure.getByRole("button", { name: "Save SVG" }).click();
  const labels = svgTexts(fs.readFileSync((await (await download).path())!, "utf8"));
  expect(labels).toContain("Case W1-roll-VC, loaded side");
  expect(labels).toContain("Case W1-roll-VC, other side");
  // The envelope names the case and the side of the extremes a rolling case makes.
  await expect(page.getByRole("table", { name: "Envelope by station" })).toContainText(/roll-V[ACD] \([^)]*side\)/);
  await shot(page, "rolling-loads");
});
