import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";
import { DEMO_CASE_INPUTS } from "../../app/demo/scenario";
import { caseStep as step, shot, signIn } from "./helpers";

/** The demo masses as an engineer enters them: the item table from CSV, mass cases typed, fills and balance. */
async function fillMasses(page: Page) {
  const m = DEMO_CASE_INPUTS.masses;
  await page.getByLabel("Semispan structural mass [kg]").fill(String(m.structureKg));
  const csv = [
    "id,description,mass [kg],x of CG [m],y (point) [m],y from [m],y to [m]",
    ...m.items.map((it) => [it.id, `"${it.label}"`, it.kg, it.x, "y" in it ? it.y : "", "yFrom" in it ? it.yFrom : "", "yTo" in it ? it.yTo : ""].join(",")),
  ].join("\n");
  await page.getByLabel("Item table CSV file").setInputFiles({ name: "tern-items.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await expect(page.locator("#items-3-0")).toHaveValue("tank-outer");
  const cases = page.locator("section", { has: page.getByRole("heading", { name: "Mass cases", exact: true }) });
  for (const [i, mc] of m.massCases.entries()) {
    await cases.getByRole("button", { name: "Add row" }).click();
    await page.locator(`#massCases-${i}-0`).fill(mc.id);
    await page.locator(`#massCases-${i}-1`).fill(mc.label);
    await page.locator(`#massCases-${i}-2`).fill(String(mc.weight));
    await page.locator(`#massCases-${i}-3`).fill(String(mc.cg * 100));
    for (const [item, v] of Object.entries(mc.fill)) await page.getByLabel(`Fill of ${item} in ${mc.id}`).fill(String(v));
  }
  await page.getByLabel("Wing–body Cm increment at zero lift").fill(String(m.balance.cmBody));
  await page.getByLabel("Tail arm [m]").fill(String(m.balance.tailArm));
}


test("an engineer builds a case from nothing and reads the critical root bending moment, equal to the command line's", async ({ page }) => {
  // Every step of a case with its solves, on a machine that may be busy: a generous limit (no timing in the checks).
  test.setTimeout(300_000);
  await signIn(page);
  await page.getByRole("link", { name: "New case" }).click();
  await page.getByLabel("Case reference").fill("E2E-WL-100");
  await page.getByLabel("Title").fill("Browser-built wing loads case");
  await page.getByRole("button", { name: "Create case" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toContainText("E2E-WL-100");

  // Basis
  await step(page, /Basis/).click();
  const b = DEMO_CASE_INPUTS.basis;
  await page.getByLabel("Category").selectOption(b.category);
  const fields: [string, number | string][] = [
    ["Max take-off [kg]", b.mtow],
    ["Max zero-fuel [kg]", b.mzfw],
    ["Minimum design [kg]", b.minWeight],
    ["VS1 [m/s]", b.vs1],
    ["VA [m/s]", b.va],
    ["VB [m/s]", b.vb],
    ["VC [m/s]", b.vc],
    ["VD [m/s]", b.vd],
    ["Wing reference area [m²]", b.wingArea],
    ["Aircraft CLmax", b.clMax],
    ["Negative CLmax", b.clMaxNegative],
    ["Altitudes [m]", b.altitudes.join(", ")],
  ];
  for (const [label, value] of fields) await page.getByLabel(label).fill(String(value));
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();
  await shot(page, "workflow-basis");

  // Planform, typed into the grid; first a negative chord, which is refused with the field named
  await step(page, /Planform/).click();
  const cell = (r: number, c: number) => page.locator(`#stations-${r}-${c}`);
  const rows = DEMO_CASE_INPUTS.planform.stations;
  await page.getByRole("button", { name: "Add row" }).click();
  for (const [i, s] of rows.entries()) {
    await cell(i, 0).fill(String(s.y));
    await cell(i, 1).fill(String(s.xLe));
    await cell(i, 2).fill(String(i === 2 ? -0.95 : s.chord));
    await cell(i, 3).fill(String(s.twist));
  }
  await page.getByLabel("Reference axis at root [chord fraction]").fill("0.35");
  await page.getByLabel("Reference axis at tip [chord fraction]").fill("0.35");
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(page.getByText("Chord must be positive").first()).toBeVisible();
  await cell(2, 2).fill(String(rows[2]!.chord));
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();
  await expect(page.getByRole("img", { name: "Planform drawn to scale" })).toBeVisible();
  await shot(page, "workflow-planform");

  // Sections, uploaded as CSV: checked, previewed, then accepted
  await step(page, /Sections/).click();
  const csv = ["y,a0,alphaL0,cmAc,clMax,cpMin", ...DEMO_CASE_INPUTS.sections.rows.map((r) => [r.y, r.a0, r.alphaL0, r.cmAc, r.clMax, r.cpMin].join(","))].join("\n");
  await page.getByLabel("CSV file").setInputFiles({ name: "tern-sections.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await page.getByRole("button", { name: "Check file" }).click();
  await expect(page.getByText("tern-sections.csv").first()).toBeVisible();
  await page.getByRole("button", { name: "Use this file's data" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();
  await expect(page.getByText("Current data from the uploaded file")).toBeVisible();
  await shot(page, "workflow-sections");

  // Masses: the item table read from a CSV file, the mass cases and the balance typed
  await step(page, /Masses/).click();
  await fillMasses(page);
  await page.getByRole("button", { name: "Save masses" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();
  await shot(page, "workflow-masses");

  // Envelope, generated from the basis rules for each mass case (4 × 3 altitudes × 12 points: the corners, the gusts
  // and the unsymmetrical condition A of 23.349(a); the uploaded sections give no aileron)
  await step(page, /Envelope/).click();
  await page.getByRole("button", { name: "Generate cases from the basis rules" }).click();
  // Generating solves the wing at every speed of every mass case: allow for a busy machine.
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible({ timeout: 60_000 });
  await expect(page.getByText("Load cases (144)")).toBeVisible();
  await shot(page, "workflow-envelope");

  // Distribution: every flagged case dispositioned
  await step(page, /Distribution/).click();
  // The first look at a new case file solves it (every mass case, with its balance): allow for a busy machine.
  await expect(page.getByRole("figure", { name: "Spanwise loading" })).toBeVisible({ timeout: 30_000 });
  // The table shows the rows in view only: every case of each reason is justified at once, one save per reason.
  const reasons = page.getByRole("table", { name: "Flagged cases by reason" });
  const labels = await reasons.getByRole("combobox", { name: /^Disposition for every case: / }).evaluateAll((els) => els.map((e) => e.getAttribute("aria-label")!));
  for (const [i, label] of labels.entries()) {
    const row = reasons.getByRole("row").filter({ has: page.getByRole("combobox", { name: label }) });
    await row.getByRole("combobox", { name: label }).selectOption("justify");
    await row.getByRole("textbox", { name: label.replace("Disposition", "Justification") }).fill("On the stall line by definition; kept in the envelope.");
    await row.getByRole("button", { name: /^Apply to all / }).click();
    await expect(page.getByText(`Dispositions saved as revision ${i + 1}.`)).toBeVisible();
  }
  await expect(page.getByText(/flagged case.* without a disposition/)).toHaveCount(0);
  await shot(page, "workflow-distribution");

  // Loads: the root-loads table, sorted by root bending, largest first
  await step(page, /Loads/).click();
  await page.getByLabel("Notes on these loads").fill(DEMO_CASE_INPUTS.loads.notes);
  await page.getByRole("button", { name: "Save", exact: true }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();
  // Wait for the results of the inputs just saved, not the ones shown before the save.
  await expect(page.getByText("from the inputs at loads revision 1")).toBeVisible({ timeout: 30_000 });
  const table = page.getByRole("table", { name: "Root loads of every case" });
  await expect(table).toBeVisible({ timeout: 30_000 });
  const headers = await table.locator("thead th").allTextContents();
  const bendingColumn = headers.findIndex((h) => h.includes("Root bending"));
  const firstRow = table.locator("tbody tr").first();
  const criticalCase = (await firstRow.locator("td").nth(0).textContent())!.trim();
  const shownKNm = Number((await firstRow.locator("td").nth(bendingColumn).textContent())!.trim());
  // The critical case's loads split into aerodynamic load, inertia relief of its mass case, and net load
  await expect(page.getByRole("heading", { name: new RegExp(`Aerodynamic load, inertia relief and net load: case ${criticalCase.replace(/[+]/g, "\\+")}`, "i") })).toBeVisible();
  await expect(page.getByRole("figure", { name: "Bending moment: aerodynamic, relief and net" })).toBeVisible({ timeout: 60_000 });
  await shot(page, "workflow-loads");

  // The same case exported and run through the command line
  const caseId = new URL(page.url()).pathname.split("/")[2]!;
  const exported = await page.request.get(`/api/v1/cases/${caseId}/export`);
  expect(exported.ok()).toBe(true);
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "sw-e2e-")), "case.json");
  fs.writeFileSync(file, await exported.text());
  const out = JSON.parse(execFileSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "app/cli/analyze.ts", file], { encoding: "utf8", maxBuffer: 256 * 1024 * 1024 })) as {
    cases: { id: string; root: { bending: number } }[];
  };
  const cliCritical = out.cases.reduce((a, c) => (c.root.bending > a.root.bending ? c : a));
  expect(criticalCase).toBe(cliCritical.id);
  // The table shows five significant figures in kN·m.
  expect(shownKNm).toBe(Number((cliCritical.root.bending / 1000).toPrecision(5)));
});

test("a stale save from a second window is refused and nothing is lost", async ({ browser }) => {
  // Two browsers and two saves: a busy machine needs more than the default time.
  test.slow();
  const one = await browser.newContext();
  const two = await browser.newContext();
  const a = await one.newPage();
  const b = await two.newPage();
  await signIn(a);
  await signIn(b);
  for (const p of [a, b]) {
    await p.getByRole("link", { name: "TN-WL-002" }).click();
    await step(p, /Basis/).click();
  }
  const b0 = DEMO_CASE_INPUTS.basis;
  const fill = async (p: Page, mtow: number) => {
    for (const [label, value] of [
      ["Max take-off [kg]", mtow],
      ["Max zero-fuel [kg]", b0.mzfw],
      ["Minimum design [kg]", b0.minWeight],
      ["VS1 [m/s]", b0.vs1],
      ["VA [m/s]", b0.va],
      ["VC [m/s]", b0.vc],
      ["VD [m/s]", b0.vd],
      ["Wing reference area [m²]", b0.wingArea],
      ["Aircraft CLmax", b0.clMax],
      ["Negative CLmax", b0.clMaxNegative],
      ["Altitudes [m]", "0"],
    ] as const)
      await p.getByLabel(label).fill(String(value));
  };
  await fill(a, 6400);
  await a.getByRole("button", { name: "Save basis" }).click();
  await expect(a.getByRole("status").filter({ hasText: /Saved as revision/ })).toBeVisible();
  await fill(b, 6500);
  await b.getByRole("button", { name: "Save basis" }).click();
  await expect(b.getByRole("alert").filter({ hasText: /Not saved: Erin Hale saved this step/ })).toBeVisible();
  await b.reload();
  await expect(b.getByLabel("Max take-off [kg]")).toHaveValue("6400");
  await one.close();
  await two.close();
});

test("what is typed into a step form before the page's scripts have run is kept when they do", async ({ page }) => {
  await signIn(page);
  await page.getByRole("link", { name: "TN-WL-001" }).click();
  await expect(page).toHaveURL(/\/cases\/[0-9a-f-]{36}$/);
  const planformUrl = `${new URL(page.url()).pathname}/planform`;
  // Hold the page's scripts back until the person has typed into the server-rendered form.
  let release!: () => void;
  const held = new Promise<void>((r) => (release = r));
  await page.route("**/assets/*.js", async (route) => {
    await held;
    await route.continue();
  });
  await page.goto(planformUrl, { waitUntil: "domcontentloaded" });
  await expect(page.locator("html[data-hydrated]")).toHaveCount(0);
  await page.locator("#stations-0-2").fill("2.13");
  release();
  await expect(page.locator("html[data-hydrated]")).toHaveCount(1);
  await expect(page.locator("#stations-0-2")).toHaveValue("2.13");
  await page.unroute("**/assets/*.js");
});
