import { and, eq } from "drizzle-orm";
import { writeAudit } from "~/db/audit.server";
import type { Db } from "~/db/client.server";
import { buildCaseFile, buildSectionsFile, caseInputs, resultsFor } from "~/services/analysis.server";
import { getCaseSteps, saveStep } from "~/services/case-steps.server";
import { flaggedCases } from "~/services/distribution.server";
import { generatedCases, vnSets } from "~/services/envelope.server";
import { DEMO_CASE_INPUTS, DEMO_CASES, DEMO_ORGANISATIONS, DEMO_PROGRAMMES, DEMO_USERS, type DemoUser } from "./scenario";
import { caseSteps, cases, memberships, organisations, programmes, reports, users } from "~/db/schema";
import { hashPassword, verifyPassword } from "~/utils/password.server";
import { STEPS } from "~/domain/steps";
import { approveCaseForIssue, approveStep, submitStep } from "~/services/review.server";
import { createReportRow, generateReport, releaseReport } from "~/services/reports.server";

/**
 * Creates the demo scenario where it is missing and leaves everything that exists alone, so it can
 * run at every start (passwords and roles changed by people are kept).
 */
export async function seedDemo(db: Db, opts: { report?: boolean } = {}): Promise<{ created: number }> {
  let created = 0;
  const orgIds: Record<string, string> = {};
  for (const [key, org] of Object.entries(DEMO_ORGANISATIONS)) {
    const [row] = await db.insert(organisations).values(org).onConflictDoNothing().returning();
    if (row) created++;
    orgIds[key] = row?.id ?? (await db.select().from(organisations).where(eq(organisations.slug, org.slug)))[0]!.id;
  }

  const userIds: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const [existing] = await db.select().from(users).where(eq(users.email, u.email));
    let id = existing?.id;
    if (!id) {
      const passwordHash = await hashPassword(u.password);
      id = await db.transaction(async (tx) => {
        const [row] = await tx.insert(users).values({ email: u.email, name: u.name, passwordHash }).returning();
        await tx.insert(memberships).values({ userId: row!.id, organisationId: orgIds[u.organisation]!, roles: u.roles });
        await writeAudit(tx, { organisationId: orgIds[u.organisation]!, actor: null, action: "seed.user.create", entityType: "user", entityId: row!.id, after: { email: u.email, roles: u.roles } });
        return row!.id;
      });
      created++;
    }
    userIds[u.label] = id;
  }

  const programmeIds: Record<string, string> = {};
  for (const p of DEMO_PROGRAMMES) {
    const organisationId = orgIds[p.organisation]!;
    const [existing] = await db.select().from(programmes).where(and(eq(programmes.organisationId, organisationId), eq(programmes.code, p.code)));
    programmeIds[p.code] =
      existing?.id ??
      (await db.transaction(async (tx) => {
        const { organisation: _org, ...values } = p;
        const [row] = await tx.insert(programmes).values({ ...values, organisationId }).returning();
        await writeAudit(tx, { organisationId, actor: null, action: "seed.programme.create", entityType: "programme", entityId: row!.id, after: row });
        created++;
        return row!.id;
      }));
  }

  for (const c of DEMO_CASES) {
    const programmeId = programmeIds[c.programme]!;
    const [existing] = await db.select().from(cases).where(and(eq(cases.programmeId, programmeId), eq(cases.reference, c.reference)));
    if (existing) continue;
    const [programme] = await db.select().from(programmes).where(eq(programmes.id, programmeId));
    const createdBy = c.programme === "NA14" ? userIds.outsider! : userIds.engineer!;
    await db.transaction(async (tx) => {
      const { programme: _p, ...values } = c;
      const [row] = await tx.insert(cases).values({ ...values, programmeId, organisationId: programme!.organisationId, createdBy }).returning();
      await writeAudit(tx, { organisationId: programme!.organisationId, actor: null, action: "seed.case.create", entityType: "case", entityId: row!.id, after: row });
    });
    created++;
  }
  created += await seedDemoCaseSteps(db, userIds.engineer!, DEMO_USERS.find((u) => u.label === "engineer")!.email);
  if (opts.report !== false) created += await seedDemoReport(db, userIds);
  return { created };
}

/**
 * Works the demo case TN-WL-001 through every step, as the demo engineer would, so that a new
 * user sees each page filled in. Skipped once the case has any saved step.
 */
async function seedDemoCaseSteps(db: Db, engineerId: string, engineerEmail: string): Promise<number> {
  const [demo] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  if (!demo) return 0;
  const steps = await getCaseSteps(demo.id);
  if (Object.values(steps).some((s) => s.revision > 0)) return 0;
  const actor = { id: engineerId, email: engineerEmail };
  const save = (step: Parameters<typeof saveStep>[0]["step"], data: Record<string, unknown>) => saveStep({ caseId: demo.id, step, baseRevision: 0, data, actor });
  const d = DEMO_CASE_INPUTS;
  await save("basis", d.basis);
  await save("planform", d.planform);
  await save("sections", d.sections);
  await save("masses", d.masses);
  const inputs = caseInputs(await getCaseSteps(demo.id));
  const loadCases = generatedCases(vnSets(inputs.basis!, inputs.planform!, inputs.sections!, d.method, inputs.masses));
  await save("envelope", { ...d.method, cases: loadCases });
  await save("loads", d.loads);
  const withLoads = caseInputs(await getCaseSteps(demo.id));
  const { result } = await resultsFor(demo.id, buildCaseFile(demo.title, withLoads, "envelope"), engineerId, buildSectionsFile(withLoads));
  const dispositions = Object.fromEntries(flaggedCases(result).map((f) => [f.id, { action: "justify", comment: d.justification }]));
  await save("distribution", { dispositions });
  const final = caseInputs(await getCaseSteps(demo.id));
  await resultsFor(demo.id, buildCaseFile(demo.title, final), engineerId, buildSectionsFile(final));
  return 7;
}

/**
 * Walks the demo case through review and issue as the demo people would: the engineer submits
 * each step (signature "prepared"), the checker approves each (signature "checked") and the case ("approved for issue"),
 * the report is generated and the quality user releases it. Skipped once the case has a report.
 */
async function seedDemoReport(db: Db, userIds: Record<string, string>): Promise<number> {
  const [demo] = await db.select().from(cases).where(eq(cases.reference, "TN-WL-001"));
  if (!demo) return 0;
  if ((await db.select({ id: reports.id }).from(reports).where(eq(reports.caseId, demo.id))).length) return 0;
  const person = async (label: DemoUser["label"]) => {
    const u = DEMO_USERS.find((x) => x.label === label)!;
    const [row] = await db.select().from(users).where(eq(users.id, userIds[label]!));
    // Signatures re-confirm identity; the seed does so with the demo password like a person would.
    if (!row?.passwordHash || !(await verifyPassword(row.passwordHash, u.password))) return null;
    const [m] = await db.select().from(memberships).where(eq(memberships.userId, row.id));
    const [o] = await db.select().from(organisations).where(eq(organisations.id, m!.organisationId));
    return { sessionId: "seed", user: { id: row.id, email: row.email, name: row.name }, organisation: { id: o!.id, name: o!.name, slug: o!.slug }, roles: m!.roles };
  };
  const engineer = await person("engineer");
  const checker = await person("checker");
  const quality = await person("quality");
  if (!engineer || !checker || !quality) return 0;
  const steps = await db.select().from(caseSteps).where(eq(caseSteps.caseId, demo.id));
  for (const s of STEPS) {
    const row = steps.find((r) => r.step === s.key);
    if (!row || row.status === "approved") continue;
    if (row.status !== "submitted") await submitStep({ caseId: demo.id, step: s.key, current: engineer, role: "engineer", confirmedBy: "password", comment: "Demo submission." });
    await approveStep({ caseId: demo.id, step: s.key, current: checker, role: "checker", confirmedBy: "password", comment: "Demo check: inputs traced to the KF-60 data pack." });
  }
  await approveCaseForIssue({ caseId: demo.id, current: checker, role: "checker", confirmedBy: "password" });
  const report = await createReportRow({ caseId: demo.id, actor: engineer.user });
  await generateReport(report.id);
  await releaseReport({ reportId: report.id, caseId: demo.id, organisationId: demo.organisationId, current: quality, role: "quality", confirmedBy: "password" });
  return 1;
}
