import { expect, type Page } from "@playwright/test";
import { DEMO_USERS, type DemoUser } from "../app/demo/scenario";

/*
 * What every browser test shares. The tests wait for what a page shows (its URL, a heading, a saved
 * revision, a figure), never for a length of time; the time limits in playwright.config.ts only say
 * when a test has hung, so a busy machine makes the run slower, not red.
 */

/** A demo person by role label (app/demo/scenario.ts). */
export const user = (label: DemoUser["label"]) => DEMO_USERS.find((u) => u.label === label)!;

/**
 * Signs in through the sign-in form, as a person does, and waits until the app has left the sign-in
 * page (a refused sign-in fails here, naming the person).
 */
export async function signIn(page: Page, label: DemoUser["label"] = "engineer") {
  const u = user(label);
  await page.goto("/login");
  await page.getByLabel("E-mail", { exact: true }).fill(u.email);
  await page.getByLabel("Password").fill(u.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page, `sign-in of ${label}`).not.toHaveURL(/\/login/);
}

/** A full-page screenshot in tests/e2e/screenshots/ (kept out of git) for people to look at. */
export const shot = (page: Page, name: string) => page.screenshot({ path: `tests/e2e/screenshots/${name}.png`, fullPage: true });

/** A step of the case's stepper, by its label. */
export const caseStep = (page: Page, name: RegExp) => page.getByRole("navigation", { name: "Steps" }).getByRole("link", { name });
