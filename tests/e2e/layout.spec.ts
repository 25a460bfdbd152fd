import { expect, test } from "@playwright/test";
import { hydrated, signIn } from "./helpers";

// A case page fits the window it is shown in: at 1 400 px wide (a laptop with the browser not quite
// full-screen) nothing makes the whole page scroll sideways; a wide table scrolls inside its own box.

const CASE_PAGES = ["", "/basis", "/planform", "/sections", "/masses", "/envelope", "/distribution", "/loads", "/review", "/reports"];

test("no page of the demo case scrolls sideways in a window 1 400 px wide", async ({ browser }) => {
  test.setTimeout(300_000);
  const page = await (await browser.newContext({ viewport: { width: 1400, height: 900 } })).newPage();
  await signIn(page, "engineer");
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  const widths: Record<string, { scroll: number; client: number }> = {};
  for (const path of CASE_PAGES) {
    await page.goto(`/cases/${demo.id}${path}`);
    await hydrated(page);
    // Charts are shown as the server's drawing (or drawn live after hydration, at the width their box had then): wait until every chart shows.
    await expect
      .poll(() => page.evaluate(() => [...document.querySelectorAll("figure")].filter((f) => f.querySelector("figcaption button")).every((f) => f.querySelector("canvas, svg[role=img]"))), { timeout: 60_000 })
      .toBe(true);
    widths[path || "/"] = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, client: document.documentElement.clientWidth }));
  }
  const overflowing = Object.entries(widths).filter(([, w]) => w.scroll > w.client);
  expect(overflowing, JSON.stringify(widths)).toEqual([]);
});
