import { expect, test } from "@playwright/test";
import { signIn } from "./helpers";

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
