import fs from "node:fs";
import { expect, test, type Page } from "@playwright/test";
import { DEMO_CASE_INPUTS } from "../../app/demo/scenario";
import { copyOfDemoCase, exported, hydrated, signIn, typeDemoBasis } from "./helpers";

// Exact unit definitions (international yard and pound, 1959; NIST SP 811 appendix B; REFERENCES.md §8):
// 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, 1 kt = 1852/3600 m/s. Expected values are computed here
// from these definitions, never taken from the application.
const FT = 0.3048;
const LB = 0.45359237;
const KT = 1852 / 3600;
// As an input shows a converted value: ten significant figures.
const shown = (v: number) => String(Number.parseFloat(v.toPrecision(10)));
const saved = (page: Page, revision: number) => page.getByRole("status").filter({ hasText: `Saved as revision ${revision}.` });

test("switching the units converts what is shown; what is typed in either system is stored in SI, and every page follows", async ({ page }) => {
  test.setTimeout(300_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-UNITS-1", { oneCase: true });
  await typeDemoBasis(page, caseId); // SI: the demo basis as typed (6350 kg, its VD in m/s), revision 1

  // Switching to US customary converts the numbers shown, it does not relabel them.
  await page.getByLabel("Units shown").selectOption("US");
  await expect(page.getByLabel("Max take-off [lb]")).toHaveValue(shown(6350 / LB));
  await expect(page.getByLabel("VD [kt]")).toHaveValue(shown(DEMO_CASE_INPUTS.basis.vd / KT));
  await page.getByLabel("VD [kt]").fill("300");
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(saved(page, 2)).toBeVisible({ timeout: 60_000 });
  await expect(page.getByLabel("VD [kt]")).toHaveValue("300");
  await expect(page.getByLabel("Max take-off [lb]")).toHaveValue(shown(6350 / LB));

  // A chord typed in feet is stored in metres.
  await page.goto(`/cases/${caseId}/planform`);
  await hydrated(page);
  // The copy's root chord as stored (other browser tests may have edited the demo it was copied from).
  const rootChord = (await exported(page, caseId)).wing.stations[0]!.chord;
  await expect(page.locator("#stations-0-2")).toHaveValue(shown(rootChord / FT));
  await page.locator("#stations-0-2").fill("7");
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(saved(page, 2)).toBeVisible({ timeout: 60_000 });
  expect((await exported(page, caseId)).wing.stations[0]!.chord).toBeCloseTo(7 * FT, 9);

  // An altitude typed in feet is stored in metres.
  await page.goto(`/cases/${caseId}/envelope`);
  await hydrated(page);
  await page.locator("#cases-0-3").fill("5000");
  await page.getByRole("button", { name: "Save envelope" }).click();
  await expect(saved(page, 2)).toBeVisible({ timeout: 60_000 });
  const first = (await exported(page, caseId)).cases[0]!;
  expect(first.altitude).toBeCloseTo(5000 * FT, 9);

  // The other pages show the same case in feet and pounds-force.
  await page.goto(`/cases/${caseId}/distribution`);
  await expect(page.getByText("5 000 ft", { exact: false }).first()).toBeVisible({ timeout: 120_000 });
  await expect(page.getByText(/· \d[\d ]* m ·/)).toHaveCount(0);
  await page.goto(`/cases/${caseId}/loads`);
  await expect(page.getByRole("columnheader", { name: /Altitude \[ft\]/ })).toBeVisible({ timeout: 120_000 });
  await expect(page.getByRole("columnheader", { name: /Root shear \[lbf\]/ })).toBeVisible();
  await expect(page.getByRole("columnheader", { name: /^y \[ft\]/ })).toBeVisible();
  const rootTable = page.getByRole("table", { name: "Root loads of every case" });
  const altitudeColumn = (await rootTable.getByRole("columnheader").allTextContents()).findIndex((h) => /Altitude \[ft\]/.test(h));
  await expect(rootTable.getByRole("row", { name: new RegExp(`^${first.id} `) }).getByRole("cell").nth(altitudeColumn)).toHaveText("5000");

  // Back to SI: the numbers shown convert back, and what is typed in metres is stored as typed.
  await page.goto(`/cases/${caseId}/basis`);
  await hydrated(page);
  await page.getByLabel("Units shown").selectOption("SI");
  await expect(page.getByLabel("VD [m/s]")).toHaveValue(shown(300 * KT));
  await expect(page.getByLabel("Max take-off [kg]")).toHaveValue("6350");
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(saved(page, 3)).toBeVisible({ timeout: 60_000 });
  await page.goto(`/cases/${caseId}/planform`);
  await hydrated(page);
  await expect(page.locator("#stations-0-2")).toHaveValue(shown(7 * FT));
  await page.locator("#stations-0-2").fill("2.2");
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(saved(page, 3)).toBeVisible({ timeout: 60_000 });
  expect((await exported(page, caseId)).wing.stations[0]!.chord).toBe(2.2);
});

test("in US units the V–n sets, the distribution, the relief chart and the root-loads CSV follow: no metre or kilogram left", async ({ page }) => {
  test.setTimeout(300_000);
  await signIn(page, "engineer");
  const caseId = await copyOfDemoCase(page, "E2E-UNITS-2", { oneCase: true });
  await typeDemoBasis(page, caseId);
  await page.getByLabel("Units shown").selectOption("US");
  await page.getByRole("button", { name: "Save basis" }).click();
  await expect(saved(page, 2)).toBeVisible({ timeout: 60_000 });
  const exportedCase = await exported(page, caseId);

  // The V–n sets are named by weight and altitude in pounds and feet (1828.8 m would read 6000 ft).
  await page.goto(`/cases/${caseId}/envelope`);
  const sets = page.getByLabel("Weight and altitude").locator("option");
  await expect(sets.first()).toBeAttached({ timeout: 120_000 });
  const names = await sets.allTextContents();
  const firstAltitudeFt = Math.round(DEMO_CASE_INPUTS.basis.altitudes[0]! / FT);
  expect(names.every((n) => /^W\d+: .+ \d+ lb, \d+ ft$/.test(n.trim())), names.join(" | ")).toBe(true);
  expect(names.some((n) => n.trim().endsWith(`, ${firstAltitudeFt} ft`))).toBe(true);

  // The distribution's header gives the altitude in feet, and nothing on the page in metres.
  await page.goto(`/cases/${caseId}/distribution`);
  const altitudeFt = exportedCase.cases[0]!.altitude / FT;
  await expect(page.getByText(/Mach [\d.]+ · [\d ]+ ft ·/).first()).toBeVisible({ timeout: 120_000 });
  await expect(page.getByText(/\d m[ ;)·]|\[m\]|\d kg\b/)).toHaveCount(0);

  // The masses step's checks of each mass case give weights in pounds, none in kilograms.
  await page.goto(`/cases/${caseId}/masses`);
  const lb = (kg: number) => String(Math.round(kg / LB));
  await expect(page.locator("main").getByText(`Weight within the basis: minimum design weight ${lb(DEMO_CASE_INPUTS.basis.minWeight)} lb to MTOW ${lb(DEMO_CASE_INPUTS.basis.mtow)} lb`).first()).toBeVisible({ timeout: 120_000 });
  await expect(page.locator("main").getByText(/\d kg\b/)).toHaveCount(0);

  // The relief breakdown's chart draws the stations in feet (its vector copy, as saved from the page).
  await page.goto(`/cases/${caseId}/loads`);
  const relief = page.getByRole("figure", { name: "Shear: aerodynamic, relief and net" });
  await expect(relief).toBeVisible({ timeout: 120_000 });
  const svgDownload = page.waitForEvent("download");
  await relief.getByRole("button", { name: "Save SVG" }).click();
  const svg = fs.readFileSync((await (await svgDownload).path())!, "utf8");
  expect(svg).toContain("Spanwise station y [ft]");
  expect(svg).not.toContain("[m]");

  // The root-loads table exports as CSV in the units shown, each header naming its unit.
  const csvDownload = page.waitForEvent("download");
  await page.getByRole("button", { name: "Export CSV" }).first().click();
  const [header, ...rows] = fs.readFileSync((await (await csvDownload).path())!, "utf8").trim().split(/\r\n/).map((l) => l.split(","));
  expect(header).toEqual(expect.arrayContaining(["Altitude [ft]", "Root shear [lbf]", "Root bending [lbf·ft]", "Root torsion [lbf·ft]"]));
  expect(header!.join(" ")).not.toMatch(/\[(m|kg|kN|kN·m)\]/);
  const row = rows.find((r) => r[0] === exportedCase.cases[0]!.id)!;
  // Five significant figures, as the table shows them.
  expect(Number(row[header!.indexOf("Altitude [ft]")])).toBe(Number(altitudeFt.toPrecision(5)));
});
