import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { DEMO_USERS, type DemoUser } from "../../app/demo/scenario";
import { submitForCheck } from "./helpers";

const who = (label: DemoUser["label"]) => DEMO_USERS.find((u) => u.label === label)!;

async function signedIn(browser: Browser, label: DemoUser["label"]): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await page.goto("/login");
  await page.getByLabel("E-mail", { exact: true }).fill(who(label).email);
  await page.getByLabel("Password").fill(who(label).password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/\/login/);
  return page;
}

/** The panel of one report version, found by its heading. */
const versionPanel = (page: Page, n: number) => page.locator("section", { has: page.getByRole("heading", { name: new RegExp(`R0${n} · version ${n}$`) }) });

const shot = (page: Page, name: string) => page.screenshot({ path: `tests/e2e/screenshots/review-${name}.png`, fullPage: true });

test("editing the approved demo planform voids the approvals downstream; resubmitted, re-approved, re-issued and released", async ({ browser }) => {
  test.setTimeout(360_000);
  const engineer = await signedIn(browser, "engineer");
  await engineer.getByRole("link", { name: "TN-WL-001" }).click();
  await expect(engineer).toHaveURL(/\/cases\/[0-9a-f-]{36}$/);
  const caseUrl = new URL(engineer.url()).pathname;
  await expect(engineer.getByText(/checked by Marek Oduya/).first()).toBeVisible();

  // The engineer changes the approved planform: a new revision, and the approvals from planform on are voided.
  await engineer.goto(`${caseUrl}/planform`);
  // Typed once the page's scripts run, as usual; typing before that is covered in workflow.spec.ts.
  await expect(engineer.locator("html[data-hydrated]")).toHaveCount(1);
  await expect(engineer.locator("#stations-0-2")).toHaveValue("2.1");
  // Before anything is saved, the page says which signatures a change would void: the checks from
  // planform on and the approval for issue, not the basis's.
  const voids = engineer.getByTestId("voids-warning");
  await expect(voids).toContainText("checked by Marek Oduya on planform");
  await expect(voids).toContainText("checked by Marek Oduya on loads");
  await expect(voids).toContainText("approved for issue by Marek Oduya");
  await expect(voids).not.toContainText("on basis");
  await engineer.locator("#stations-0-2").fill("2.12");
  await engineer.getByRole("button", { name: "Save planform" }).click();
  await expect(engineer.getByRole("status").filter({ hasText: "Saved as revision 2" })).toBeVisible();
  await expect(voids).toHaveCount(0);
  await engineer.goto(caseUrl);
  await expect(engineer.getByText(/approval voided: planform changed to revision 2/).first()).toBeVisible();
  await expect(engineer.getByText(/checked by Marek Oduya/)).toHaveCount(1);
  await shot(engineer, "overview-voided");

  // The engineer resubmits every step that went back to draft, and cannot approve any of them.
  await engineer.goto(`${caseUrl}/review`);
  for (const step of ["planform", "sections", "masses", "envelope", "distribution", "loads"]) {
    await submitForCheck(engineer, step);
  }
  await expect(engineer.getByText(/prepared by Erin Hale/).first()).toBeVisible();
  await expect(engineer.getByRole("button", { name: /^Approve / })).toHaveCount(0);

  // The checker signs each with their password, then the case for issue.
  const checker = await signedIn(browser, "checker");
  await checker.goto(`${caseUrl}/review`);
  for (const step of ["planform", "sections", "masses", "envelope", "distribution", "loads"]) {
    await checker.locator(`#pw-${step}`).fill(who("checker").password);
    await checker.getByRole("button", { name: `Approve ${step} (sign: checked)` }).click();
    await expect(checker.getByText(`${step} approved and signed.`)).toBeVisible();
  }
  await checker.locator('input[name="password"]').last().fill(who("checker").password);
  await checker.getByRole("button", { name: "Approve the case for issue (sign)" }).click();
  // The approval re-checks the case's results (every case of every mass case): allow for a busy machine.
  await expect(checker.getByText("Case approved for issue and signed.")).toBeVisible({ timeout: 60_000 });
  await shot(checker, "approved");

  // The engineer issues version 2; the page follows the background job to the end.
  await engineer.goto(`${caseUrl}/reports`);
  await engineer.getByRole("button", { name: "Issue the next version" }).click();
  // Requesting it freezes the snapshot first (the results of every case): allow for a busy machine.
  await expect(engineer.getByText(/KF60-TN-WL-001-R02 · version 2/)).toBeVisible({ timeout: 60_000 });
  await expect(versionPanel(engineer, 2).getByText("Download PDF")).toBeVisible({ timeout: 90_000 });
  await expect(engineer.getByRole("button", { name: /Release/ })).toHaveCount(0);
  await expect(engineer.getByText("What changed from version 1 to 2")).toBeVisible();
  await expect(engineer.getByRole("row", { name: /planform revision 1 2/ })).toBeVisible();
  await shot(engineer, "reports-v2");

  // Quality releases it with a signature and downloads exactly the stored bytes.
  const quality = await signedIn(browser, "quality");
  await quality.goto(`${caseUrl}/reports`);
  const v2 = versionPanel(quality, 2);
  await v2.locator('input[name="password"]').fill(who("quality").password);
  await v2.getByRole("button", { name: "Release (sign: released)" }).click();
  await expect(quality.getByText("Report released and signed.")).toBeVisible();
  const href = await versionPanel(quality, 2).getByRole("link", { name: "Download PDF" }).getAttribute("href");
  const pdf = await quality.request.get(href!);
  expect(pdf.headers()["content-type"]).toBe("application/pdf");
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "sw-e2e-pdf-")), "report.pdf");
  fs.writeFileSync(file, await pdf.body());
  const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
  expect(text).toContain("Wing loads, initial type certificate");
  expect(text).toContain("Marek Oduya");
  expect(text).toMatch(/Prepared by\s+Erin Hale \(engineer\), 7 steps/);
  expect(text).toMatch(/Checked by\s+Marek Oduya \(checker\), 7 steps/);
  expect(text).toMatch(/Approved for issue by\s+Marek Oduya \(checker\)/);
  expect(text).toContain("KF60-TN-WL-001-R02");
  const listing = await quality.request.get(`/api/v1/cases/${caseUrl.split("/")[2]}/reports`);
  const reports = (await listing.json()) as { reports: { version: number; status: string; signatures: { name: string; meaning: string }[] }[] };
  const second = reports.reports.find((r) => r.version === 2)!;
  expect(second.status).toBe("released");
  expect(second.signatures.map((s) => `${s.name}: ${s.meaning}`)).toContain("Priya Lindqvist: released");
  await shot(quality, "released");

  // The outsider cannot reach it.
  const outsider = await signedIn(browser, "outsider");
  const refused = await outsider.request.get(href!);
  expect(refused.status()).toBe(404);
  expect(refused.headers()["content-type"]).not.toBe("application/pdf");
});
