import { expect, test } from "@playwright/test";
import { demoUser as user, shot, signIn } from "./helpers";

const LANDING = {
  engineer: { path: "/cases", heading: "Cases", nav: ["Cases", "Programmes", "Reports"], hidden: ["Checks", "Audit trail", "Members"] },
  checker: { path: "/checks", heading: "Waiting for your check", nav: ["Cases", "Programmes", "Checks", "Reports"], hidden: ["Audit trail", "Members"] },
  quality: { path: "/reports", heading: "Reports", nav: ["Cases", "Programmes", "Reports", "Audit trail"], hidden: ["Checks", "Members"] },
  admin: { path: "/admin", heading: "Members", nav: ["Cases", "Programmes", "Audit trail", "Members"], hidden: ["Checks", "Reports"] },
} as const;

for (const [label, expected] of Object.entries(LANDING) as [keyof typeof LANDING, (typeof LANDING)[keyof typeof LANDING]][]) {
  test(`the ${label} signs in with a password and lands on a page made for the role`, async ({ page }) => {
    await signIn(page, label);
    await expect(page).toHaveURL(expected.path);
    await expect(page.getByRole("heading", { level: 1, name: expected.heading })).toBeVisible();
    const nav = page.getByRole("navigation", { name: "Main" });
    for (const item of expected.nav) await expect(nav.getByRole("link", { name: item })).toBeVisible();
    for (const item of expected.hidden) await expect(nav.getByRole("link", { name: item })).toHaveCount(0);
    await expect(page.getByTestId("organisation")).toHaveText("Kelvard Fenlow Aircraft");
    await shot(page, `landing-${label}`);
  });
}

test("a role is refused pages it may not use, with a clear message", async ({ page }) => {
  await signIn(page, "engineer");
  await expect(page).toHaveURL("/cases");
  const res = await page.goto("/admin");
  expect(res?.status()).toBe(403);
  await expect(page.getByRole("heading", { name: "Not allowed" })).toBeVisible();
  await shot(page, "refused-engineer-admin");
});

test("the outsider cannot reach Kelvard's case or programme by URL", async ({ page, browser }) => {
  await signIn(page, "engineer");
  await page.getByRole("link", { name: "TN-WL-001" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toContainText("TN-WL-001");
  const caseUrl = new URL(page.url()).pathname;
  await shot(page, "case-overview");

  const other = await browser.newContext();
  const outsider = await other.newPage();
  await signIn(outsider, "outsider");
  await expect(outsider).toHaveURL("/cases");
  await expect(outsider.getByTestId("organisation")).toHaveText("Northmoor Aerostructures");
  await expect(outsider.getByText("TN-WL-001")).toHaveCount(0);
  const res = await outsider.goto(caseUrl);
  expect(res?.status()).toBe(404);
  await expect(outsider.getByRole("heading", { name: "Not found" })).toBeVisible();
  await expect(outsider.getByText("Wing loads, initial type certificate")).toHaveCount(0);
  await shot(outsider, "outsider-refused");
  await other.close();
});

test("a wrong password is refused and says so", async ({ page }) => {
  await page.goto("/login");
  await page.getByLabel("E-mail", { exact: true }).fill(user("checker").email);
  await page.getByLabel("Password").fill("definitely-wrong");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert")).toContainText("not correct");
  await expect(page).toHaveURL(/\/login/);
  await shot(page, "login-refused");
});

test("the checker signs in through company sign-in: the stand-in asks for the demo password first", async ({ page }) => {
  await page.goto("/login");
  await page.getByLabel("Company e-mail").fill(user("checker").email);
  await page.getByRole("button", { name: "Continue with company sign-in" }).click();
  // The identity provider's own page: nothing is answered for the person without a credential.
  await expect(page.getByRole("heading", { name: "Local sign-in stand-in" })).toBeVisible();
  await expect(page.getByLabel("E-mail")).toHaveValue(user("checker").email);
  await page.getByLabel("Password").fill("not-the-password");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert")).toContainText("not correct");
  await page.getByLabel("Password").fill(user("checker").password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL("/checks");
  await page.goto("/account");
  await expect(page.getByText("company sign-in")).toBeVisible();
});

test("company sign-in for an address the identity provider does not know is refused there", async ({ page }) => {
  await page.goto("/login");
  await page.getByLabel("Company e-mail").fill("stranger@kelvard-fenlow.example");
  await page.getByRole("button", { name: "Continue with company sign-in" }).click();
  await expect(page.getByRole("heading", { name: "Local sign-in stand-in" })).toBeVisible();
  await page.getByLabel("Password").fill("anything-at-all");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert")).toContainText("not correct");
  await page.goto("/cases");
  await expect(page).toHaveURL(/\/login/);
});

test("a tampered session cookie is refused and the person is asked to sign in again", async ({ page, context }) => {
  await signIn(page, "quality");
  await expect(page).toHaveURL("/reports");
  const cookies = await context.cookies();
  const session = cookies.find((c) => c.name === "sw_session")!;
  await context.clearCookies();
  await context.addCookies([{ ...session, value: session.value.replace(/.$/, (c) => (c === "a" ? "b" : "a")) }]);
  await page.goto("/audit");
  await expect(page).toHaveURL(/\/login\?redirectTo=%2Faudit&reason=session/);
  await expect(page.getByText("Your session has ended")).toBeVisible();
});

test("signing out ends the session", async ({ page }) => {
  await signIn(page, "admin");
  await expect(page).toHaveURL("/admin");
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/login\?reason=signed-out/);
  await page.goto("/admin");
  await expect(page).toHaveURL(/\/login\?redirectTo=%2Fadmin/);
});
