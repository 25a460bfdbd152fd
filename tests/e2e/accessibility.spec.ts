import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { hydrated, signIn } from "./helpers";

/*
 * Every page passes axe-core's WCAG 2.0 and 2.1 rules of levels A and AA (the tags wcag2a, wcag2aa,
 * wcag21a, wcag21aa): text contrast, links told apart by more than colour, labelled controls,
 * keyboard access to scrolling regions, and the rest. No rule is switched off. Each page is checked
 * once what it computes after loading (the distribution's solves, the loads) has arrived.
 */
const WCAG_A_AA = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"];

async function violations(page: Page) {
  await hydrated(page);
  await expect(page.getByRole("heading", { level: 1 }).first()).toBeVisible();
  await expect(page.getByText(/^(Computing|Solving)\b/)).toHaveCount(0, { timeout: 120_000 });
  const { violations } = await new AxeBuilder({ page }).withTags(WCAG_A_AA).analyze();
  // Named by rule and element, so a failure says what to fix and where.
  return violations.flatMap((v) => v.nodes.map((n) => `${v.id}: ${n.target.join(" ")} — ${(n.any[0]?.message ?? n.failureSummary ?? "").split("\n")[0]}`));
}

async function demoCase(page: Page): Promise<string> {
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  return `/cases/${list.cases.find((c) => c.reference === "TN-WL-001")!.id}`;
}

test("the sign-in page passes the WCAG 2 A and AA checks", async ({ page }) => {
  await page.goto("/login");
  expect(await violations(page)).toEqual([]);
});

const ENGINEER_PAGES: [string, (demo: string) => string][] = [
  ["case list", () => "/cases"],
  ["new case", () => "/cases/new"],
  ["case overview", (c) => c],
  ["basis", (c) => `${c}/basis`],
  ["planform", (c) => `${c}/planform`],
  ["sections", (c) => `${c}/sections`],
  ["masses", (c) => `${c}/masses`],
  ["envelope", (c) => `${c}/envelope`],
  ["distribution", (c) => `${c}/distribution`],
  ["loads", (c) => `${c}/loads`],
  ["review", (c) => `${c}/review`],
  ["reports", (c) => `${c}/reports`],
  ["report compare", (c) => `${c}/reports/compare`],
  ["programmes", () => "/programmes"],
  ["checks", () => "/checks"],
  ["method statement", () => "/methods"],
  ["all reports", () => "/reports"],
  ["account", () => "/account"],
  ["API tokens", () => "/account/tokens"],
  ["API", () => "/api"],
];

test("every page an engineer reads passes the WCAG 2 A and AA checks", async ({ page }) => {
  test.setTimeout(600_000);
  await signIn(page, "engineer");
  const demo = await demoCase(page);
  const found: Record<string, string[]> = {};
  for (const [name, url] of ENGINEER_PAGES) {
    await page.goto(url(demo));
    const v = await violations(page);
    if (v.length) found[name] = v;
  }
  expect(found).toEqual({});
});

test("the pages of the checker, quality and administrator pass the WCAG 2 A and AA checks", async ({ browser }) => {
  test.setTimeout(300_000);
  const found: Record<string, string[]> = {};
  for (const [role, pages] of [
    ["checker", ["review"]],
    ["quality", ["reports", "audit"]],
    ["admin", ["audit", "admin"]],
  ] as const) {
    const page = await (await browser.newContext()).newPage();
    await signIn(page, role);
    const demo = await demoCase(page);
    for (const name of pages) {
      await page.goto(name === "review" || name === "reports" ? `${demo}/${name}` : `/${name}`);
      const v = await violations(page);
      if (v.length) found[`${role}: ${name}`] = v;
    }
    await page.context().close();
  }
  expect(found).toEqual({});
});
