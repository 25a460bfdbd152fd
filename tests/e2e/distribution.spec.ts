import { expect, test } from "@playwright/test";
import pg from "pg";
import { copyOfDemoCase, hydrated, shot, signedIn, signIn } from "./helpers";

// The distribution page reads the stored results and solves nothing itself: a case file whose results
// are not stored yet shows the worker's progress, then the flagged cases; the shown case's distribution
// is fetched after the page shows, the picker asks the server for matching case ids, and a save sends
// only the rows changed. Dispositions changed outside the app are refused until an administrator puts
// back the revision as it was saved.

test("the distribution page waits for the results, finds a case by part of its id, and a disposition saved reaches the stored revision", async ({ page, browser }) => {
  await signIn(page, "engineer");
  // A copy of its own: nothing stored for its inputs yet, and no disposition.
  const caseId = await copyOfDemoCase(page, "TN-DIST-E2E");
  await page.goto(`/cases/${caseId}/distribution`);
  await hydrated(page);

  // The results come from the job worker; the page then shows the flagged cases and the first one's distribution.
  const table = page.getByRole("table", { name: "Flagged cases and their dispositions" });
  await expect(table).toBeVisible({ timeout: 120_000 });
  await expect(page.getByRole("alert").filter({ hasText: /flagged cases? without a disposition/ })).toBeVisible();
  await expect(page.getByRole("table", { name: "Flagged cases by reason" })).toBeVisible();
  await expect(page.getByRole("figure", { name: "Spanwise loading" })).toBeVisible({ timeout: 60_000 });

  // The picker: part of an id typed, the server's suggestions, one chosen.
  const search = page.getByRole("search", { name: "Find a load case" });
  await search.getByRole("textbox", { name: "Case" }).fill("gust+vc");
  const matches = search.getByRole("list", { name: "Matching cases" });
  await expect(matches.getByRole("button").first()).toBeVisible();
  const suggested = (await matches.getByRole("button").allTextContents()).map((t) => t.replace(" ⚠", ""));
  expect(suggested.length).toBeGreaterThan(0);
  expect(suggested.every((id) => id.toLowerCase().includes("gust+vc"))).toBe(true);
  const chosen = suggested[suggested.length - 1]!;
  await matches.getByRole("button", { name: new RegExp(`^${chosen.replace(/[+]/g, "\\+")}( ⚠)?$`) }).click();
  await expect(page.getByText(`Case ${chosen}`, { exact: true })).toBeVisible();
  await expect(page.getByRole("heading", { name: `Spanwise methods compared: case ${chosen}` })).toBeVisible();
  await expect(page.getByText(/^Computing the distribution of case/)).toHaveCount(0, { timeout: 60_000 });
  await expect(page.getByText(new RegExp(`^Case ${chosen.replace(/[+]/g, "\\+")}$`)).locator("xpath=..")).toContainText("Mach");

  // One row dispositioned and saved: only it is sent, and the stored step holds it at revision 1.
  const select = table.getByRole("combobox", { name: /^Disposition of / }).first();
  const id = (await select.getAttribute("aria-label"))!.replace("Disposition of ", "");
  await select.selectOption("justify");
  await table.getByRole("textbox", { name: `Justification for ${id}` }).fill("Inside the wind-tunnel data's range; kept in the envelope.");
  const posted = page.waitForRequest((r) => r.method() === "POST" && r.url().includes(`/cases/${caseId}/distribution`));
  await page.getByRole("button", { name: "Save dispositions" }).click();
  expect(JSON.parse((await posted).postData() ?? "{}")).toEqual({ intent: "rows", revision: 0, changed: [{ id, action: "justify", comment: "Inside the wind-tunnel data's range; kept in the envelope." }] });
  await expect(page.getByText("Dispositions saved as revision 1.")).toBeVisible();
  const steps = (await (await page.request.get(`/api/v1/cases/${caseId}`)).json()) as { steps: { step: string; revision: number }[] };
  expect(steps.steps.find((s) => s.step === "distribution")?.revision).toBe(1);
  const rows = (await (await page.request.get(`/api/cases/${caseId}/flagged-cases?offset=0&limit=50`)).json()) as { revision: number; rows: { id: string; disposition: { action: string; comment: string } | null }[] };
  expect(rows.revision).toBe(1);
  expect(rows.rows.find((r) => r.id === id)?.disposition).toEqual({ action: "justify", comment: "Inside the wind-tunnel data's range; kept in the envelope." });
  await expect(table.getByRole("combobox", { name: `Disposition of ${id}` })).toHaveValue("justify");
  await shot(page, "distribution-dispositions");

  // The last row, fetched by range once scrolled into view, saved alone: merged with the first.
  const total = Number(await table.getAttribute("aria-rowcount")) - 1;
  const scroller = page.getByTestId("flagged-cases");
  const last = table.locator(`tr[aria-rowindex="${total + 1}"]`).getByRole("combobox", { name: /^Disposition of / });
  await expect(async () => {
    await scroller.evaluate((el) => el.scrollTo(0, el.scrollHeight));
    await expect(last).toBeVisible({ timeout: 1000 });
  }).toPass();
  const lastId = (await last.getAttribute("aria-label"))!.replace("Disposition of ", "");
  await last.selectOption("exclude");
  await page.getByRole("button", { name: "Save dispositions" }).click();
  await expect(page.getByText("Dispositions saved as revision 2.")).toBeVisible();
  const tail = (await (await page.request.get(`/api/cases/${caseId}/flagged-cases?offset=${total - 1}&limit=1`)).json()) as typeof rows;
  expect(tail.rows).toEqual([expect.objectContaining({ id: lastId, disposition: { action: "exclude", comment: "" } })]);
  const head = (await (await page.request.get(`/api/cases/${caseId}/flagged-cases?offset=0&limit=50`)).json()) as typeof rows;
  expect(head.rows.find((r) => r.id === id)?.disposition).toEqual({ action: "justify", comment: "Inside the wind-tunnel data's range; kept in the envelope." });

  // A disposition changed in the database, outside Spanwright, to one its rules refuse: the page says
  // so, and an administrator puts back revision 2 as it was saved; the page then says what was done
  // (before, the step came back with no word of it).
  const sql = new pg.Client({ connectionString: process.env.E2E_DATABASE_URL });
  await sql.connect();
  try {
    const changed = await sql.query(`update case_steps set data = jsonb_set(data, array['dispositions', $2::text], '{"action": "maybe"}'::jsonb) where case_id = $1 and step = 'distribution'`, [caseId, id]);
    expect(changed.rowCount).toBe(1);
  } finally {
    await sql.end();
  }
  const admin = await signedIn(browser, "admin");
  await admin.goto(`/cases/${caseId}/distribution`);
  await hydrated(admin);
  await expect(admin.getByText("The stored dispositions cannot be used", { exact: true })).toBeVisible();
  await admin.getByRole("button", { name: "Put back revision 2" }).click();
  await expect(admin.getByText("Revision 2 put back as it was saved; what was found instead is kept in the audit log.", { exact: true })).toBeVisible();
  await expect(admin.getByRole("table", { name: "Flagged cases and their dispositions" })).toBeVisible();
  await expect(admin.getByText("The stored dispositions cannot be used", { exact: true })).toHaveCount(0);
  const back = (await (await admin.request.get(`/api/cases/${caseId}/flagged-cases?offset=0&limit=50`)).json()) as typeof rows;
  expect(back.revision).toBe(2);
  expect(back.rows.find((r) => r.id === id)?.disposition).toEqual({ action: "justify", comment: "Inside the wind-tunnel data's range; kept in the envelope." });
  await shot(admin, "distribution-put-back");
  await admin.context().close();
});
