import fs from "node:fs";
import { expect, test } from "@playwright/test";
import { copyOfDemoCase, hydrated, signIn, typeDemoBasis } from "./helpers";

// What a chart prints: axes end at round values. The chart is read through its own "Save SVG",
// which hands over the server's drawing of the page's ECharts option, so its labels are text.

/** The text of every label in an SVG file. */
const svgTexts = (svg: string) => [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!.trim()).filter(Boolean);

test("the span axis of a loads chart ends at a round value, in feet as in metres", async ({ page }) => {
  test.setTimeout(300_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-CHART-1", { oneCase: true });
  await typeDemoBasis(page, caseId);
  // In feet the demo's semispan (8.7 m) is 28.54330708661417 ft: the data's own end is not round.
  await page.getByLabel("Units shown").selectOption("US");
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 2." })).toBeVisible({ timeout: 60_000 });

  await page.goto(`/cases/${caseId}/loads`);
  await hydrated(page);
  const figure = page.getByRole("figure", { name: "Shear force along the span" });
  await expect(figure.getByRole("img", { name: "Shear force along the span" })).toBeVisible({ timeout: 120_000 });
  const download = page.waitForEvent("download");
  await figure.getByRole("button", { name: "Save SVG" }).click();
  const svg = fs.readFileSync((await (await download).path())!, "utf8");
  const labels = svgTexts(svg);
  expect(labels).toContain("Spanwise station y [ft]");
  const numbers = labels.filter((t) => /^[−-]?[\d.,\s]+$/.test(t));
  expect(numbers.length).toBeGreaterThan(4);
  // Every tick label is a round number (at most two decimals), and the span axis ends at 30 ft.
  for (const n of numbers) expect(n).toMatch(/^[−-]?[\d,\s]*(\.\d{1,2})?$/);
  expect(numbers).toContain("30");
  expect(numbers.join(" ")).not.toContain("28.54");
});
