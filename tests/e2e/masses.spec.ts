import { expect, test, type Page } from "@playwright/test";
import { DEMO_CASE_INPUTS, DEMO_USERS } from "../../app/demo/scenario";

const engineer = DEMO_USERS.find((u) => u.label === "engineer")!;
const shot = (page: Page, name: string) => page.screenshot({ path: `tests/e2e/screenshots/masses-${name}.png`, fullPage: true });
const step = (page: Page, name: RegExp) => page.getByRole("navigation", { name: "Steps" }).getByRole("link", { name });

async function signIn(page: Page) {
  await page.goto("/login");
  await page.getByLabel("E-mail", { exact: true }).fill(engineer.email);
  await page.getByLabel("Password").fill(engineer.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL("/cases");
}

const csvOf = (rows: (string | number)[][]) => rows.map((r) => r.join(",")).join("\n");

test("an engineer enters the masses of a semispan from a CSV file, its mass cases and balance, and reads what each puts on the wing", async ({ page }) => {
  test.setTimeout(120_000);
  await signIn(page);
  await page.getByRole("link", { name: "New case" }).click();
  await page.getByLabel("Case reference").fill("E2E-MASS-1");
  await page.getByLabel("Title").fill("Masses of the Tern wing");
  await page.getByRole("button", { name: "Create case" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toContainText("E2E-MASS-1");

  // The planform first: items are placed on the wing.
  await step(page, /Planform/).click();
  await page.getByRole("button", { name: "Add row" }).click();
  for (const [i, s] of DEMO_CASE_INPUTS.planform.stations.entries()) {
    for (const [j, v] of [s.y, s.xLe, s.chord, s.twist].entries()) await page.locator(`#stations-${i}-${j}`).fill(String(v));
  }
  await page.getByRole("button", { name: "Save planform" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();

  await step(page, /Masses/).click();
  await expect(page.getByRole("heading", { name: "Masses", level: 1 })).toBeVisible();
  await page.locator("html[data-hydrated]").waitFor();

  // A file with a bad row is not read, and says where.
  await page.getByLabel("Item table CSV file").setInputFiles({ name: "bad.csv", mimeType: "text/csv", buffer: Buffer.from(csvOf([["id", "mass [kg]", "x of CG [m]", "y (point) [m]"], ["engine", "heavy", -0.55, 2.6]])) });
  await expect(page.getByRole("alert")).toContainText('Line 2, column mass [kg]: "heavy" is not a number');

  // The good file fills the item table; one item lies beyond the tip, which the save refuses by row.
  const m = DEMO_CASE_INPUTS.masses;
  const rows = m.items.map((it) => [it.id, it.kg, it.x, "y" in it ? it.y : "", "yFrom" in it ? it.yFrom : "", "yTo" in it ? (it.id === "tank-outer" ? 9.2 : it.yTo) : ""]);
  await page.getByLabel("Item table CSV file").setInputFiles({ name: "tern-items.csv", mimeType: "text/csv", buffer: Buffer.from(csvOf([["id", "mass", "x", "y", "y from", "y to"], ...rows])) });
  await expect(page.locator("#items-3-0")).toHaveValue("tank-outer");
  await expect(page.getByRole("alert")).toHaveCount(0);
  await page.getByLabel("Semispan structural mass [kg]").fill(String(m.structureKg));
  const cases = page.locator("section", { has: page.getByRole("heading", { name: "Mass cases", exact: true }) });
  for (const [i, mc] of m.massCases.entries()) {
    await cases.getByRole("button", { name: "Add row" }).click();
    for (const [j, v] of [mc.id, mc.label, mc.weight, mc.cg * 100].entries()) await page.locator(`#massCases-${i}-${j}`).fill(String(v));
    for (const [item, v] of Object.entries(mc.fill)) await page.getByLabel(`Fill of ${item} in ${mc.id}`).fill(String(v));
  }
  await page.getByLabel("Wing–body Cm increment at zero lift").fill(String(m.balance.cmBody));
  await page.getByRole("button", { name: "Save masses" }).click();
  // Half a balance is refused beside its field; the item beyond the tip by its row.
  await expect(page.getByText("Give both the wing–body Cm increment and the tail arm for a balance, or neither")).toBeVisible();
  await page.getByLabel("Tail arm [m]").fill(String(m.balance.tailArm));
  await page.getByRole("button", { name: "Save masses" }).click();
  await expect(page.getByText(/Item row 4: Item tank-outer: y to 9\.2 m lies outside the wing \(semispan 8\.7 m\)/)).toBeVisible();
  await page.locator("#items-3-6").fill(String(6.2));
  await page.getByRole("button", { name: "Save masses" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Saved as revision 1" })).toBeVisible();

  // What each mass case puts on the wing, checked against the basis where there is one.
  const table = page.getByRole("table", { name: "Mass cases" }).last();
  await expect(table).toContainText("MZFW");
  // Zero fuel: engine 290 kg + gear 95 kg on one side.
  await expect(table.getByRole("row").filter({ has: page.getByRole("cell", { name: "MZFW", exact: true }) })).toContainText("385");
  await expect(page.getByRole("img", { name: "Planform drawn to scale" })).toBeVisible();
  await expect(page.getByText(/centres of gravity on the MAC \(MTOW-full 28\.0 %/)).toBeVisible();
  await shot(page, "saved");

  // The saved item table exports as CSV with the units in its header, and reads back the same.
  const download = page.waitForEvent("download");
  await page.locator("section", { has: page.getByRole("heading", { name: "Mass items of one semispan" }) }).getByRole("button", { name: "Export CSV" }).click();
  const file = await (await download).path();
  await page.getByLabel("Item table CSV file").setInputFiles(file!);
  await expect(page.locator("#items-2-0")).toHaveValue("tank-inner");
  await expect(page.locator("#items-2-5")).toHaveValue("0.5");
  await expect(page.getByRole("alert")).toHaveCount(0);
});
