import { expect, test, type Response } from "@playwright/test";
import { signIn } from "./helpers";

// What the browser downloads: compressed, only the chart types drawn, nothing of the server.
// Behaviour, not timing: which headers and which code arrive, never how fast.

test("pages and their scripts arrive compressed, with only the chart parts drawn and no server code", async ({ page: first }) => {
  await signIn(first);
  await first.getByRole("link", { name: "TN-WL-001" }).first().click();
  await first.getByRole("navigation", { name: "Steps" }).getByRole("link", { name: /Loads/ }).click();
  await expect(first.getByRole("figure", { name: "Bending moment along the span" }).getByRole("img", { name: "Bending moment along the span" })).toBeVisible({ timeout: 60_000 });
  // A full load of the same page, in a tab of its own: the document itself, its styles and every
  // script of the route, and the live chart's, which comes when the pointer reaches a chart. (Not a
  // reload of the first tab: what that tab was still fetching when idle could not be read after it.)
  const page = await first.context().newPage();
  const responses: Response[] = [];
  page.on("response", (r) => responses.push(r));
  await page.goto(first.url());
  const bending = page.getByRole("figure", { name: "Bending moment along the span" });
  await expect(bending.getByRole("img", { name: "Bending moment along the span" })).toBeVisible({ timeout: 60_000 });
  await bending.hover();
  await expect(bending.locator("canvas")).toHaveCount(1, { timeout: 60_000 });

  const doc = responses.find((r) => r.request().resourceType() === "document")!;
  expect(doc.headers()["content-encoding"], "the page's HTML").toMatch(/^(br|gzip)$/);
  const scripts = responses.filter((r) => r.request().resourceType() === "script" && r.url().includes("/assets/"));
  expect(scripts.length).toBeGreaterThan(3);
  let chartCode = "";
  for (const s of scripts) {
    const body = await s.text();
    if (body.length > 1024) expect(s.headers()["content-encoding"], s.url()).toMatch(/^(br|gzip)$/);
    // The database library and the schema stay on the server.
    expect(body, s.url()).not.toMatch(/drizzle-orm|pg-protocol|pgTable\(|pg-boss/);
    if (body.includes("series.line")) chartCode = body;
  }
  expect(chartCode, "the chart chunk").not.toBe("");
  // Only the series the pages draw (line, scatter) are registered; the whole library is not sent.
  for (const unused of ["series.pie", "series.bar", "series.candlestick", "series.map"]) expect(chartCode).not.toContain(unused);
  const css = responses.find((r) => r.request().resourceType() === "stylesheet")!;
  expect(css.headers()["content-encoding"]).toMatch(/^(br|gzip)$/);
});
