import fs from "node:fs";
import { expect, test, type Page } from "@playwright/test";
import { caseStep, demoCaseId, hydrated, signIn } from "./helpers";

// The charts are drawn by the server as SVG and sent with the page's data: a page shows them without
// the chart library, which is fetched only when the user reaches for a chart (the pointer on it, a
// touch, focus within it, "Save PNG"), and then replaces the drawing in place. Properties, not
// times: what is requested, what the page holds; no test here waits for a duration.

/** Watches the page's requests for the live chart's chunk (components/charts/echarts-client). */
function chartChunkRequests(page: Page) {
  const urls: string[] = [];
  page.on("request", (r) => {
    if (/\/echarts-client-[^/]*\.js/.test(r.url())) urls.push(r.url());
  });
  return urls;
}

/** Until the browser has been idle twice since now: what a page starts once it answers input (the live charts, before) has started. */
const afterIdle = (page: Page) => page.evaluate(() => new Promise<void>((done) => requestIdleCallback(() => requestIdleCallback(() => done(), { timeout: 5000 }), { timeout: 5000 })));

test("the envelope page's V–n diagram is in the server's HTML as an SVG image, and the chart library comes only when the pointer reaches the chart", async ({ page }) => {
  await signIn(page, "engineer");
  const caseId = await demoCaseId(page);
  const html = await (await page.request.get(`/cases/${caseId}/envelope`)).text();
  const figure = /<figure aria-label="V–n diagram"[^>]*>([\s\S]*?)<\/figure>/.exec(html)?.[1] ?? "";
  expect(figure).toMatch(/<svg role="img" aria-label="V–n diagram"[^>]*viewBox=/);
  expect(figure).toContain("Equivalent airspeed [");

  const chunk = chartChunkRequests(page);
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  const vn = page.getByRole("figure", { name: "V–n diagram" });
  await expect(vn.getByRole("img", { name: "V–n diagram" })).toBeVisible();
  await afterIdle(page);
  await page.waitForLoadState("networkidle");
  expect(chunk).toEqual([]);
  await expect(vn.locator("canvas")).toHaveCount(0);

  // The box keeps its size as the live chart replaces the drawing.
  const before = await vn.boundingBox();
  await vn.hover();
  await expect(vn.locator("canvas")).toHaveCount(1);
  await expect(vn.getByRole("img", { name: "V–n diagram" })).toHaveCount(0);
  expect(chunk.length).toBe(1);
  expect(await vn.boundingBox()).toEqual(before);
});

test("the distribution and loads pages draw their charts from the SVG sent with the fetched data, on a visit and from the case's rail, without the chart library", async ({ page }) => {
  await signIn(page, "engineer");
  const caseId = await demoCaseId(page);
  const chunk = chartChunkRequests(page);
  await page.goto(`/cases/${caseId}/distribution`);
  await hydrated(page);
  for (const name of ["Spanwise loading", "Section lift coefficient", "cl by compressibility rule", "cm by compressibility rule", "Critical Mach number"]) {
    await expect(page.getByRole("figure", { name }).getByRole("img", { name })).toBeVisible({ timeout: 60_000 });
  }
  await expect(page.getByRole("figure", { name: /by spanwise method$/ }).getByRole("img")).toBeVisible({ timeout: 60_000 });
  await afterIdle(page);
  await page.waitForLoadState("networkidle");
  expect(chunk).toEqual([]);

  await caseStep(page, /Loads/).click();
  await expect(page).toHaveURL(/\/loads$/);
  const shear = page.getByRole("figure", { name: "Shear force along the span" });
  await expect(shear.getByRole("img", { name: "Shear force along the span" })).toBeVisible({ timeout: 60_000 });
  await expect(page.getByRole("figure", { name: "Shear: aerodynamic, relief and net" }).getByRole("img")).toBeVisible({ timeout: 60_000 });
  await afterIdle(page);
  await page.waitForLoadState("networkidle");
  expect(chunk).toEqual([]);

  // "Save SVG" hands over the server's drawing, still without the library.
  const download = page.waitForEvent("download");
  await shear.getByRole("button", { name: "Save SVG" }).focus();
  await page.keyboard.press("Enter");
  const svg = fs.readFileSync((await (await download).path())!, "utf8");
  expect(svg).toMatch(/^<svg width="\d+" height="320" xmlns="http:\/\/www.w3.org\/2000\/svg"/);
  expect(svg).toContain("Spanwise station y [");
  // Focus within the figure is reaching for it: the live chart replaces the drawing.
  await expect(shear.locator("canvas")).toHaveCount(1);
  expect(chunk.length).toBe(1);
});

test("'Save PNG' on a chart still drawn by the server loads the live chart and saves its image", async ({ page }) => {
  await signIn(page, "engineer");
  await page.goto(`/cases/${await demoCaseId(page)}/envelope`);
  await hydrated(page);
  const vn = page.getByRole("figure", { name: "V–n diagram" });
  await expect(vn.getByRole("img", { name: "V–n diagram" })).toBeVisible();
  const download = page.waitForEvent("download");
  // By keyboard: no pointer has reached the chart before the button is pressed.
  await vn.getByRole("button", { name: "Save PNG" }).focus();
  await page.keyboard.press("Enter");
  const png = fs.readFileSync((await (await download).path())!);
  expect(png.subarray(1, 4).toString("latin1")).toBe("PNG");
  await expect(vn.locator("canvas")).toHaveCount(1);
});
