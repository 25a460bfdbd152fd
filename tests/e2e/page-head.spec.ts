import { expect, test } from "@playwright/test";
import { hydrated, signIn } from "./helpers";

// What a page's <head> asks for first. Over HTTP/1.1 a browser opens six connections per origin: the
// stylesheet, which holds back the first paint and every script after it, is asked for before the
// route modules' preloads, not after fifteen of them.

test("the stylesheet is asked for before the scripts' preloads, on a case page and the sign-in page", async ({ page }) => {
  const order = (html: string) => {
    const head = html.slice(0, html.indexOf("</head>"));
    return { css: head.search(/<link[^>]*rel="stylesheet"/), preload: head.search(/<link[^>]*rel="modulepreload"/) };
  };
  const login = order(await (await page.request.get("/login")).text());
  expect(login.css).toBeGreaterThan(0);
  expect(login.css).toBeLessThan(login.preload);

  await signIn(page, "engineer");
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  const res = await page.request.get(`/cases/${demo.id}/envelope`);
  expect(res.status()).toBe(200);
  const envelope = order(await res.text());
  expect(envelope.css).toBeGreaterThan(0);
  expect(envelope.css).toBeLessThan(envelope.preload);
  // And the page is styled by it: <html> takes the canvas colour of app.css, not the browser's white.
  await page.goto(`/cases/${demo.id}/envelope`);
  await expect(page.locator("html")).toHaveCSS("background-color", "rgb(243, 245, 248)");
});

// The web font: one variable file for every weight, its Latin part preloaded ahead of the stylesheet,
// and the pages are set in it once it has loaded (headings at 600, text at 400, table heads at 700).
test("the text is set in Source Sans 3 from one preloaded variable file", async ({ page }) => {
  const html = await (await page.request.get("/login")).text();
  const head = html.slice(0, html.indexOf("</head>"));
  const links = [...head.matchAll(/<link [^>]*>/g)];
  const fontPreload = links.find((l) => /rel="preload"/.test(l[0]) && /as="font"/.test(l[0]) && /source-sans-3-latin-wght-normal-[\w-]+\.woff2/.test(l[0]))?.index ?? -1;
  expect(fontPreload).toBeGreaterThan(0);
  expect(fontPreload).toBeLessThan(head.search(/<link[^>]*rel="stylesheet"/));

  await signIn(page, "engineer");
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  await page.goto(`/cases/${list.cases.find((c) => c.reference === "TN-WL-001")!.id}`);
  const heading = page.getByRole("heading", { level: 1 }).first();
  await expect(heading).toHaveCSS("font-family", /^"?Source Sans 3 Variable"?,/);
  // Waits for the faces the page uses; then every weight the page draws comes from that one file.
  const faces = await page.evaluate(async () => {
    await document.fonts.ready;
    const loaded = [...document.fonts].filter((f) => f.status === "loaded");
    return {
      families: [...new Set(loaded.map((f) => f.family.replace(/"/g, "")))],
      weights: [...new Set(loaded.map((f) => f.weight))],
      drawn: [400, 600, 700].map((w) => document.fonts.check(`${w} 16px "Source Sans 3 Variable"`, "Spanwright")),
    };
  });
  expect(faces.families).toEqual(["Source Sans 3 Variable"]);
  expect(faces.weights).toEqual(["200 900"]);
  expect(faces.drawn).toEqual([true, true, true]);
});

// A page whose text has Greek letters (α, Δ, η) is set partly from the Greek face, a second file. Found
// only at the first layout, it came after the page's scripts, and the page was laid out again when it
// arrived: the pages whose route says so (handle, utils/page-fonts.ts) preload it with the Latin one.
test("every font file a case page loads is preloaded ahead of the stylesheet, and one the stylesheet uses", async ({ page }) => {
  await signIn(page, "engineer");
  const list = (await (await page.request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  const demo = list.cases.find((c) => c.reference === "TN-WL-001")!;
  const preloadedFonts: Record<string, string[]> = {};
  for (const step of ["", "/basis", "/planform", "/sections", "/masses", "/envelope", "/distribution", "/loads", "/review", "/reports"]) {
    const path = `/cases/${demo.id}${step}`;
    const html = await (await page.request.get(path)).text();
    const head = html.slice(0, html.indexOf("</head>"));
    const stylesheet = /<link[^>]*rel="stylesheet"[^>]*href="([^"]+)"/.exec(head);
    expect(stylesheet, path).not.toBeNull();
    const css = await (await page.request.get(stylesheet![1]!)).text();
    const fonts = [...head.matchAll(/<link [^>]*>/g)].filter((l) => /rel="preload"/.test(l[0]) && /as="font"/.test(l[0]));
    for (const l of fonts) {
      expect(l.index, `${path}: font preload before the stylesheet`).toBeLessThan(stylesheet!.index);
      expect(css, `${path}: the stylesheet uses the preloaded file`).toContain(/href="([^"]+)"/.exec(l[0])![1]!);
    }
    preloadedFonts[step || "/"] = fonts.map((l) => /href="([^"]+)"/.exec(l[0])![1]!);

    await page.goto(path);
    await hydrated(page);
    const loaded = await page.evaluate(async () => {
      await document.fonts.ready;
      return performance.getEntriesByType("resource").filter((r) => /\.woff2$/.test(r.name)).map((r) => new URL(r.name).pathname);
    });
    expect(loaded.length, `${path}: a font file loaded`).toBeGreaterThan(0);
    expect(loaded.filter((f) => !preloadedFonts[step || "/"]!.includes(f)), `${path}: font files loaded without a preload`).toEqual([]);
  }
  // Only what a page draws: the overview, without Greek letters, preloads the Latin file alone.
  expect(preloadedFonts["/"]).toHaveLength(1);
  expect(preloadedFonts["/"]![0]).toMatch(/\/source-sans-3-latin-wght-normal-[\w-]+\.woff2$/);
});
