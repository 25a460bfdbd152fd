import { expect, test, type Page } from "@playwright/test";
import { caseStep, copyOfDemoCase, demoCaseId, exported, hydrated, signIn } from "./helpers";

// What a case page's scripts must hold before the page can answer its first click: the modules the
// document preloads are all evaluated before React hydrates it. zod and the step schemas (some
// 100 KB) are not among them on the pages that only need them to check a form: they are loaded when
// something on the page first takes the focus, or at the form's first check, and the form checks as before.

/** zod 4's core names its base class so; no other module of the app carries the string. */
const ZOD_MARK = "$ZodType";

/** The scripts the server's document preloads (every static import of the page's route modules). */
async function preloadedScripts(page: Page, path: string): Promise<{ href: string; text: string }[]> {
  const html = await (await page.request.get(path)).text();
  const hrefs = [...html.matchAll(/<link rel="modulepreload" href="([^"]+)"/g)].map((m) => m[1]!);
  return Promise.all(hrefs.map(async (href) => ({ href, text: await (await page.request.get(href)).text() })));
}

// Each page with a field whose check needs the schema: a value it refuses, and what it says.
const PAGES = [
  { step: "basis", field: "Max take-off", typed: "heavy", says: "Maximum design take-off weight must be a number" },
  { step: "envelope", field: "Output stations per semispan", typed: "3", says: "At least 8 stations" },
  { step: "planform", field: "Reference axis at root [chord fraction]", typed: "abc", says: "Reference axis at the root must be a number" },
  { step: "sections", field: null, typed: "", says: "" },
  { step: "masses", field: "Wing–body Cm increment at zero lift", typed: "abc", says: "Wing–body Cm increment must be a number" },
  { step: "loads", field: "Notes on these loads", typed: "x".repeat(4001), says: "At most 4000 characters" },
] as const;

for (const { step, field, typed, says } of PAGES) {
  test(`the ${step} page preloads no zod${field ? ", and its form still checks a field once touched" : ""}`, async ({ page }) => {
    await signIn(page, "engineer");
    const path = `/cases/${await copyOfDemoCase(page, `E2E-SCRIPTS-${step}`)}/${step}`;
    const scripts = await preloadedScripts(page, path);
    expect(scripts.some((s) => new RegExp(`/${step}-[\\w-]+\\.js$`).test(s.href)), "the page's own module is preloaded").toBe(true);
    expect(scripts.filter((s) => s.text.includes(ZOD_MARK)).map((s) => s.href)).toEqual([]);
    if (!field) return;
    await page.goto(path);
    await hydrated(page);
    const input = page.getByLabel(field);
    await input.fill(typed);
    await input.blur();
    await expect(page.getByText(says)).toBeVisible();
  });
}

test("when the form's schema cannot be loaded, a save posts what was typed and the server's check answers", async ({ page }) => {
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-SCRIPTS-NO-SCHEMA");
  const before = await exported(page, caseId);
  // The connection drops for the schema's module (or a newer version of the app no longer has it).
  await page.route("**/assets/envelope.schema-*.js", (route) => route.abort());
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  await page.getByLabel("Output stations per semispan").fill("3");
  await page.getByRole("button", { name: "Save envelope" }).click();
  await expect(page.getByText("At least 8 stations")).toBeVisible();
  expect(await exported(page, caseId)).toEqual(before);
});

// Each script the document preloads is a request before the page can hydrate, and over HTTP/1.1's
// six connections per origin they go out six at a time. React, react-dom and React Router come in one
// chunk with our small modules every page draws; react-hook-form, TanStack Table and TanStack Virtual
// in one chunk each with our modules that use them (vite.config.ts); a page asks only for what it draws.
// The counts include React Router's route manifest; the demo pages asked for 10, 19 and 16 scripts
// before, with the framework and our grid, form and table modules in chunks of a few hundred bytes each.
/** A string each library's built code keeps (an option name), found in no other module of the app. */
const LIBRARY_MARKS = { "react-hook-form": "shouldUnregister", "TanStack Table": "debugTable", "TanStack Virtual": "scrollMargin" } as const;
const SCRIPT_BUDGETS = [
  { page: "overview", path: "", most: 8, libraries: [] },
  { page: "envelope", path: "/envelope", most: 13, libraries: ["react-hook-form", "TanStack Table", "TanStack Virtual"] },
  { page: "distribution", path: "/distribution", most: 12, libraries: ["TanStack Virtual"] },
] as const;

test("the demo case's overview, envelope and distribution pages preload at most 8, 13 and 12 scripts, each library in one of them and only where it is drawn", async ({ page }) => {
  await signIn(page, "engineer");
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  for (const { page: name, path, most, libraries } of SCRIPT_BUDGETS) {
    const scripts = await preloadedScripts(page, `/cases/${demo.id}${path}`);
    expect(scripts.length, `${name}: ${scripts.map((s) => s.href).join(", ")}`).toBeLessThanOrEqual(most);
    for (const [library, mark] of Object.entries(LIBRARY_MARKS)) {
      const holding = scripts.filter((s) => s.text.includes(mark)).length;
      expect(holding, `${name}: scripts holding ${library}`).toBe((libraries as readonly string[]).includes(library) ? 1 : 0);
    }
  }
});

// A step opened from the case's rail used to wait for its code as well as its data: the browser
// fetched the route's module, and only once it had read it, the chunks that module imports.
test("a case page fetches its rail's steps' code once idle, never their data; a step opened from the rail then fetches its data and no script", async ({ page }) => {
  await signIn(page, "engineer");
  const caseId = await demoCaseId(page);
  const requested: string[] = [];
  page.on("request", (r) => void requested.push(new URL(r.url()).pathname));
  await page.goto(`/cases/${caseId}`);
  await hydrated(page);
  // The page's idle time (its own idle callbacks, queued first, have run), then its requests done.
  await page.evaluate(() => new Promise<void>((done) => requestIdleCallback(() => done(), { timeout: 5000 })));
  await page.waitForLoadState("networkidle");
  const envelopeCode = await page.evaluate(() => {
    const route = (window as unknown as { __reactRouterManifest: { routes: Record<string, { module: string; imports: string[] }> } }).__reactRouterManifest.routes["routes/cases/envelope"]!;
    return [route.module, ...route.imports];
  });
  const fetchedOrInPage = new Set([...requested, ...(await page.evaluate(() => [...document.querySelectorAll("link[rel=modulepreload]")].map((l) => new URL((l as HTMLLinkElement).href).pathname)))]);
  expect(envelopeCode.filter((href) => !fetchedOrInPage.has(href))).toEqual([]);
  expect(requested.filter((p) => p.endsWith(".data"))).toEqual([]);

  requested.length = 0;
  await caseStep(page, /Envelope/).click();
  await expect(page.getByRole("heading", { level: 1, name: "Envelope" })).toBeVisible();
  await hydrated(page);
  expect(requested.filter((p) => p.endsWith(".js"))).toEqual([]);
  expect(requested).toContain(`/cases/${caseId}/envelope.data`);
});
