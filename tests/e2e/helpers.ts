import { expect, type Browser, type Page } from "@playwright/test";
import { DEMO_CASE_INPUTS, DEMO_USERS, type DemoUser } from "../../app/demo/scenario";

/*
 * Shared steps of the browser tests: sign-in, screenshots, the stepper, a case of one's own, the
 * basis typed in. The tests wait for what a page shows (its URL, a heading, a saved revision, a
 * figure), never for a length of time; the limits in playwright.config.ts only say when a test has
 * hung, so a busy machine makes the run slower, not red (docs/decisions/012).
 */
export const demoUser = (label: DemoUser["label"]) => DEMO_USERS.find((u) => u.label === label)!;

export async function signIn(page: Page, label: DemoUser["label"] = "engineer") {
  const u = demoUser(label);
  await page.goto("/login");
  await page.getByLabel("E-mail", { exact: true }).fill(u.email);
  await page.getByLabel("Password").fill(u.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/\/login/);
}

/** A full-page screenshot in tests/e2e/screenshots/ (kept out of git) for people to look at. */
export const shot = (page: Page, name: string) => page.screenshot({ path: `tests/e2e/screenshots/${name}.png`, fullPage: true });

/** A step of the case's stepper, by its label. */
export const caseStep = (page: Page, name: RegExp) => page.getByRole("navigation", { name: "Steps" }).getByRole("link", { name });

export async function signedIn(browser: Browser, label: DemoUser["label"]): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await signIn(page, label);
  return page;
}

/** Waits until the page's scripts have run (root.tsx marks html[data-hydrated]). */
export async function hydrated(page: Page) {
  await expect(page.locator("html[data-hydrated]")).toHaveCount(1);
}

/**
 * A new case of the signed-in engineer with the demo case's planform, sections, envelope and loads
 * (through the API's export and import, as a user of the API would copy one), and no basis yet.
 * Each test works on its own copy, so the seeded demo cases stay as other tests expect them.
 */
export async function copyOfDemoCase(page: Page, reference: string, opts: { oneCase?: boolean } = {}): Promise<string> {
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string; programme: { id: string } }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  const document = (await (await page.request.get(`/api/v1/cases/${demo.id}/export`)).json()) as { cases: { id: string; massCase?: string }[]; massCases?: { id: string }[] };
  // Imported cases count as added by hand: with `oneCase` a single one under an id of its own, so
  // that cases generated from the basis later do not clash with the demo's ids.
  // Its mass cases are then only the one that case uses: a mass case takes its weight from the cases
  // that name it, and one named by no case would be left without a weight to generate cases for.
  if (opts.oneCase) {
    document.cases = [{ ...document.cases[0]!, id: "hand-1" }];
    if (document.massCases) document.massCases = document.massCases.filter((mc) => mc.id === document.cases[0]!.massCase);
  }
  const created = await page.request.post("/api/v1/cases/import", {
    data: { programmeId: demo.programme.id, reference, title: `Copy of the demo case (${reference})`, case: document },
    headers: { Origin: new URL(page.url()).origin },
  });
  expect(created.status(), await created.text()).toBe(201);
  return ((await created.json()) as { id: string }).id;
}

/** The demo basis typed into the basis form in SI units, and saved. */
export async function typeDemoBasis(page: Page, caseId: string) {
  await page.goto(`/cases/${caseId}/basis`);
  await hydrated(page);
  const b = DEMO_CASE_INPUTS.basis;
  await page.getByLabel("Category").selectOption(b.category);
  const fields: [string, number | string][] = [
    ["Max take-off [kg]", b.mtow],
    ["Max zero-fuel [kg]", b.mzfw],
    ["Minimum design [kg]", b.minWeight],
    ["VS1 [m/s]", b.vs1],
    ["VA [m/s]", b.va],
    ["VC [m/s]", b.vc],
    ["VD [m/s]", b.vd],
    ["Wing reference area [m²]", b.wingArea],
    ["Aircraft CLmax", b.clMax],
    ["Negative CLmax", b.clMaxNegative],
    ["Altitudes [m]", b.altitudes.join(", ")],
  ];
  for (const [label, value] of fields) await page.getByLabel(label).fill(String(value));
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(page.getByRole("status").filter({ hasText: /Saved as revision/ })).toBeVisible();
}

/** The case as stored, in the exchange format (SI). */
export async function exported(page: Page, caseId: string) {
  const res = await page.request.get(`/api/v1/cases/${caseId}/export`);
  expect(res.ok()).toBe(true);
  return (await res.json()) as { cases: { id: string; altitude: number; mach: number; weight?: number; nz?: number }[]; wing: { stations: { y: number; chord: number }[] } };
}

/**
 * Holds back the page's re-reading of its data after a post (the GET of `<page>.data`), as a busy
 * server would, until `release` is called: what the page shows in that time is what a person sees
 * between the answer and the new data. After `release` nothing more is held.
 */
export async function holdReloads(page: Page, pageName: string) {
  let held = true;
  const waiting: (() => void)[] = [];
  const matches = (url: URL) => url.pathname.endsWith(`/${pageName}.data`);
  await page.route(matches, async (route) => {
    if (held && route.request().method() === "GET") await new Promise<void>((r) => waiting.push(r));
    await route.continue();
  });
  return {
    release: () => {
      held = false;
      waiting.splice(0).forEach((r) => r());
    },
    stop: () => page.unroute(matches),
  };
}

/**
 * Submits a step from the review page, signed by the engineer as its preparer with their password,
 * and waits for the answer (a submission re-checks the step's results: allow for a busy machine).
 */
export async function submitForCheck(page: Page, step: string, label: DemoUser["label"] = "engineer") {
  await page.locator(`#pw-submit-${step}`).fill(demoUser(label).password);
  await page.getByRole("button", { name: `Submit ${step} for check` }).click();
  await expect(page.getByRole("alert").or(page.getByRole("status")).filter({ hasText: `${step} submitted for check` })).toBeVisible({ timeout: 60_000 });
}

/**
 * Counts React's renders by part of a page. Installed before the page's scripts run, it stands in for
 * React's developer-tools hook, which react-dom calls at every commit (production builds too), and for
 * each commit finds the components that rendered in it — a fiber not in the previous commit's tree
 * that did work — and the elements each draws itself (not those of the components it renders).
 * `regions` names parts of the page by a CSS selector; `rendersIn(page, name)` is the number of
 * commits in which a component drawing an element of that part rendered. The fiber's fields read here
 * are React's internals: fine for a test, nothing else.
 */
export async function countRenders(page: Page, regions: Record<string, string>) {
  await page.addInitScript((regions: Record<string, string>) => {
    const counts: Record<string, number> = Object.fromEntries(Object.keys(regions).map((k) => [k, 0]));
    (window as unknown as { __renders: Record<string, number> }).__renders = counts;
    type Fiber = { tag: number; flags: number; child: Fiber | null; sibling: Fiber | null; stateNode: unknown };
    const COMPONENT_TAGS = new Set([0, 1, 11, 14, 15]); // function, class, forwardRef, memo, simple memo
    const HOST = 5;
    const PERFORMED_WORK = 1;
    /** The elements a component draws itself: its host descendants short of the next component. */
    const ownElements = (fiber: Fiber): Element[] => {
      const out: Element[] = [];
      const stack = fiber.child ? [fiber.child] : [];
      while (stack.length) {
        const f = stack.pop()!;
        if (f.sibling) stack.push(f.sibling);
        if (COMPONENT_TAGS.has(f.tag)) continue;
        if (f.tag === HOST && f.stateNode instanceof Element) out.push(f.stateNode);
        if (f.child) stack.push(f.child);
      }
      return out;
    };
    let previous = new Set<Fiber>();
    (window as unknown as { __REACT_DEVTOOLS_GLOBAL_HOOK__: unknown }).__REACT_DEVTOOLS_GLOBAL_HOOK__ = {
      supportsFiber: true,
      isDisabled: false,
      renderers: new Map(),
      inject: () => 1,
      onCommitFiberRoot: (_id: number, root: { current: Fiber }) => {
        const seen = new Set<Fiber>();
        const drawn: Element[] = [];
        const stack: Fiber[] = [root.current];
        while (stack.length) {
          const f = stack.pop()!;
          seen.add(f);
          if (COMPONENT_TAGS.has(f.tag) && !previous.has(f) && (f.flags & PERFORMED_WORK) !== 0) drawn.push(...ownElements(f));
          if (f.sibling) stack.push(f.sibling);
          if (f.child) stack.push(f.child);
        }
        previous = seen;
        for (const [name, selector] of Object.entries(regions)) if (drawn.some((el) => el.closest(selector))) counts[name]!++;
      },
      onCommitFiberUnmount: () => {},
      onPostCommitFiberRoot: () => {},
    };
  }, regions);
}

export const rendersIn = (page: Page, region: string) => page.evaluate((region) => (window as unknown as { __renders: Record<string, number> }).__renders[region], region);

/** The demo case TN-WL-001's id (seeded; read it, do not change it). */
export async function demoCaseId(page: Page): Promise<string> {
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  return list.cases.find((c) => c.reference === "TN-WL-001")!.id;
}
