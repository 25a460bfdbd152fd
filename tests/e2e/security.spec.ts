import { expect, test, type APIRequestContext } from "@playwright/test";
import { DEMO_USERS, type DemoUser } from "../../app/demo/scenario";

/**
 * Web security at the HTTP level, against the production build the e2e server runs: headers and
 * the CSP nonce, the same-origin check on writes, the session cookie's attributes, sign-in
 * throttling, error answers without internals, and the content types of downloads.
 */

const ORIGIN = process.env.E2E_ORIGIN ?? "http://127.0.0.1:3100";
const user = (label: DemoUser["label"]) => DEMO_USERS.find((u) => u.label === label)!;

async function signIn(request: APIRequestContext, label: DemoUser["label"]) {
  const u = user(label);
  const res = await request.post("/login", { form: { email: u.email, password: u.password }, headers: { Origin: ORIGIN }, maxRedirects: 0 });
  expect(res.status(), `sign-in of ${label}`).toBe(302);
  return res;
}

async function demoCaseId(request: APIRequestContext): Promise<string> {
  const list = (await (await request.get("/api/v1/cases")).json()) as { cases: { id: string; reference: string }[] };
  return list.cases.find((c) => c.reference === "TN-WL-001")!.id;
}

function cspOf(header: string | undefined): Map<string, string> {
  expect(header, "Content-Security-Policy header").toBeTruthy();
  return new Map(header!.split(";").map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name!, values.join(" ")]));
}

test.describe("security headers", () => {
  test("documents carry a CSP whose nonce is on every script, new on every request", async ({ request }) => {
    const a = await request.get("/login");
    const b = await request.get("/login");
    const csp = cspOf(a.headers()["content-security-policy"]);
    const scriptSrc = csp.get("script-src")!;
    expect(scriptSrc).not.toContain("'unsafe-inline'");
    expect(scriptSrc).not.toContain("'unsafe-eval'");
    const nonce = /'nonce-([^']+)'/.exec(scriptSrc)?.[1];
    expect(nonce, "script-src names a nonce").toBeTruthy();
    expect(csp.get("frame-ancestors")).toBe("'none'");
    expect(csp.get("object-src")).toBe("'none'");
    expect(csp.get("base-uri")).toBe("'self'");
    expect(csp.get("default-src")).toBe("'self'");
    const otherNonce = /'nonce-([^']+)'/.exec(cspOf(b.headers()["content-security-policy"]).get("script-src")!)?.[1];
    expect(otherNonce).not.toBe(nonce);

    const html = await a.text();
    const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) {
      // Scripts loaded from our origin are allowed by 'self'; every inline one must carry the nonce.
      if (!/\bsrc=/.test(tag)) expect(tag, "inline script carries the nonce").toContain(`nonce="${nonce}"`);
    }
  });

  test("every answer says no framing, no sniffing and no cross-site referrer", async ({ request }) => {
    await signIn(request, "engineer");
    for (const path of ["/login", "/cases", "/api/v1/cases", "/healthz", "/api/v1/openapi.json", "/favicon.ico"]) {
      const res = await request.get(path);
      const h = res.headers();
      expect(h["x-content-type-options"], path).toBe("nosniff");
      expect(h["x-frame-options"], path).toBe("DENY");
      expect(h["referrer-policy"], path).toBe("same-origin");
      expect(cspOf(h["content-security-policy"]).get("frame-ancestors"), path).toBe("'none'");
      expect(h["x-powered-by"], path).toBeUndefined();
    }
  });

  test("the pages run under the policy without a single violation", async ({ page }) => {
    const violations: string[] = [];
    await page.addInitScript(() => {
      document.addEventListener("securitypolicyviolation", (e) => {
        (window as unknown as { __csp: string[] }).__csp ??= [];
        (window as unknown as { __csp: string[] }).__csp.push(`${e.violatedDirective} ${e.blockedURI} ${e.sourceFile}:${e.lineNumber}:${e.columnNumber}`);
      });
    });
    page.on("console", (m) => {
      if (/Content Security Policy/i.test(m.text())) violations.push(m.text());
    });
    await page.goto("/login");
    await page.getByLabel("E-mail", { exact: true }).fill(user("engineer").email);
    await page.getByLabel("Password").fill(user("engineer").password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page).toHaveURL("/cases");
    // A client-side navigation proves the hydrated app runs: the nonce let React Router's scripts in.
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Programmes" }).click();
    await expect(page).toHaveURL("/programmes");
    const caseId = await demoCaseId(page.request);
    await page.goto(`/cases/${caseId}/loads`);
    await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    const seen = await page.evaluate(() => (window as unknown as { __csp?: string[] }).__csp ?? []);
    expect([...seen, ...violations]).toEqual([]);
  });
});

test.describe("cross-site requests", () => {
  test("a write from another site is refused before it reaches the app, with or without a session", async ({ request }) => {
    await signIn(request, "engineer");
    const before = (await (await request.get("/api/v1/cases")).json()) as { cases: unknown[] };
    const forged = { reference: "CSRF-1", title: "Forged", programmeId: "00000000-0000-4000-8000-000000000000" };
    const byOrigin = await request.post("/cases/new", { form: forged, headers: { Origin: "https://evil.example" }, maxRedirects: 0 });
    expect(byOrigin.status()).toBe(403);
    expect(await byOrigin.text()).toContain("Cross-site request refused");
    const byReferer = await request.post("/cases/new", { form: forged, headers: { Referer: "https://evil.example/page" }, maxRedirects: 0 });
    expect(byReferer.status()).toBe(403);
    const signOut = await request.post("/logout", { headers: { Origin: "https://evil.example" }, maxRedirects: 0 });
    expect(signOut.status()).toBe(403);
    const after = (await (await request.get("/api/v1/cases")).json()) as { cases: unknown[] };
    expect(after.cases.length).toBe(before.cases.length);
    // The same request from our own origin reaches the action (which answers the bad programme id with 400).
    const own = await request.post("/cases/new", { form: forged, headers: { Origin: ORIGIN }, maxRedirects: 0 });
    expect(own.status()).toBe(400);
  });

  test("the session cookie is httpOnly and SameSite=Lax, and holds only a token", async ({ request }) => {
    const res = await signIn(request, "checker");
    const cookie = res.headersArray().find((h) => h.name.toLowerCase() === "set-cookie")!.value;
    expect(cookie).toMatch(/;\s*HttpOnly/i);
    expect(cookie).toMatch(/;\s*SameSite=Lax/i);
    expect(cookie).toMatch(/;\s*Path=\//i);
    expect(cookie).not.toContain(user("checker").email);
  });
});

test("sign-in is throttled at the HTTP level with a growing delay, and the owner's known browser is not held back", async ({ request, playwright }) => {
  // An account no later spec signs in to, and a client address of this spec's own (behind the
  // trusted proxy), so no other spec is held back.
  const u = user("outsider");
  const from = { Origin: ORIGIN, "X-Forwarded-For": `203.0.113.${1 + Math.floor(Math.random() * 250)}` };
  const owner = await playwright.request.newContext({ baseURL: ORIGIN });
  const first = await owner.post("/login", { form: { email: u.email, password: u.password }, headers: { Origin: ORIGIN }, maxRedirects: 0 });
  expect(first.status()).toBe(302);
  expect(first.headersArray().some((h) => h.name.toLowerCase() === "set-cookie" && h.value.startsWith("sw_device="))).toBe(true);

  // A stranger guesses: the first three are answered 401; then each attempt must wait, longer every time.
  const statuses: number[] = [];
  let refused: Awaited<ReturnType<typeof request.post>> | undefined;
  for (let i = 0; i < 20 && !refused; i++) {
    const res = await request.post("/login", { form: { email: u.email, password: `wrong-${i}` }, headers: from, maxRedirects: 0 });
    statuses.push(res.status());
    if (res.status() === 429) refused = res;
  }
  expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
  expect(refused, `statuses: ${statuses.join(", ")}`).toBeTruthy();
  expect(Number(refused!.headers()["retry-after"])).toBeGreaterThan(0);
  expect(await refused!.text()).toContain("Too many failed sign-in attempts");

  // The owner's browser, which signed in before, is not locked out by the stranger.
  const again = await owner.post("/login", { form: { email: u.email, password: u.password }, headers: { Origin: ORIGIN }, maxRedirects: 0 });
  expect(again.status()).toBe(302);
  await owner.dispose();
});

test.describe("errors say nothing about the inside", () => {
  const internals = /\bat\s+\S+\s+\(|node_modules|\/work\/|\.tsx?:\d+|Error:\s|postgres(ql)?:\/\/|S3RVER|stack/i;

  test("a request that makes the server fail answers 500 or 400 without a stack trace or secrets", async ({ request }) => {
    for (const path of ["/cases/%E0%A4%A", "/%"]) {
      const res = await request.get(path);
      expect(res.status(), path).toBeGreaterThanOrEqual(400);
      expect(await res.text(), path).not.toMatch(internals);
    }
    await signIn(request, "engineer");
    // A multipart body that ends in the middle of a part: the body parser throws.
    const caseId = await demoCaseId(request);
    const broken = await request.post(`/cases/${caseId}/sections`, {
      headers: { Origin: ORIGIN, "Content-Type": "multipart/form-data; boundary=xyz" },
      data: "--xyz\r\nContent-Disposition: form-data; name=\"file\"; filename=\"a.csv\"\r\n\r\nstation,cl",
      maxRedirects: 0,
    });
    expect(broken.status()).toBeGreaterThanOrEqual(400);
    expect(await broken.text()).not.toMatch(internals);
  });

  test("an unknown API endpoint and a refused API call answer JSON without internals", async ({ request }) => {
    const missing = await request.get("/api/v1/nothing-here");
    expect(missing.status()).toBe(404);
    expect(missing.headers()["content-type"]).toContain("application/json");
    const anon = await request.get("/api/v1/cases");
    expect(anon.status()).toBe(401);
    expect(await anon.text()).not.toMatch(internals);
  });
});

test.describe("downloads", () => {
  test("report PDF, results CSV and case export have the right type and disposition", async ({ request }) => {
    await signIn(request, "engineer");
    const caseId = await demoCaseId(request);

    const exported = await request.get(`/api/v1/cases/${caseId}/export`);
    expect(exported.status()).toBe(200);
    expect(exported.headers()["content-type"]).toMatch(/^application\/json/);
    expect(exported.headers()["content-disposition"]).toMatch(/filename="TN-WL-001\.case\.json"/);
    expect(((await exported.json()) as { schema: string }).schema).toBe("spanwright.case/1");

    const csv = await request.get(`/api/v1/cases/${caseId}/results?format=csv`);
    expect(csv.status()).toBe(200);
    expect(csv.headers()["content-type"]).toBe("text/csv; charset=utf-8");
    expect(csv.headers()["content-disposition"]).toMatch(/^attachment; filename="[^"/\\]+-results\.csv"$/);

    const list = (await (await request.get(`/api/v1/cases/${caseId}/reports`)).json()) as { reports: { id: string; status: string }[] };
    const issued = list.reports.find((r) => r.status === "issued" || r.status === "released");
    expect(issued, "the seeded demo report").toBeTruthy();
    const pdf = await request.get(`/api/v1/reports/${issued!.id}/pdf`);
    expect(pdf.status()).toBe(200);
    expect(pdf.headers()["content-type"]).toBe("application/pdf");
    expect(pdf.headers()["content-disposition"]).toMatch(/^attachment; filename="[^"/\\]+\.pdf"$/);
    expect((await pdf.body()).subarray(0, 5).toString("latin1")).toBe("%PDF-");
  });
});

test("HTML in a review comment is stored as text and rendered escaped; Unicode stays intact", async ({ request }) => {
  await signIn(request, "checker");
  const caseId = await demoCaseId(request);
  const marker = `m${Date.now()}`;
  const body = `<script>alert("${marker}")</script> <img src=x onerror=alert(1)> Ångström — 翼根 ✓`;
  const posted = await request.post(`/cases/${caseId}/review`, { form: { intent: "comment", step: "planform", body }, headers: { Origin: ORIGIN }, maxRedirects: 0 });
  expect(posted.status()).toBeLessThan(400);
  const html = await (await request.get(`/cases/${caseId}/review`)).text();
  expect(html).toContain(`&lt;script&gt;alert(&quot;${marker}&quot;)&lt;/script&gt;`);
  expect(html).toContain("Ångström — 翼根 ✓");
  expect(html).not.toContain(`<script>alert("${marker}")`);
  expect(html).not.toContain("<img src=x onerror");
});
