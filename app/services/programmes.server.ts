import { and, asc, count, desc, eq, sql } from "drizzle-orm";
import { writeAudit } from "~/db/audit.server";
import { db, prepared, type Db, type Tx } from "~/db/client.server";
import { cases, programmes, users } from "~/db/schema";
import type { CaseStatus } from "~/domain/vocabulary";
import type { Actor } from "~/domain/people";
import { DomainError } from "~/domain/errors";


export async function listProgrammes(organisationId: string, database: Db | Tx = db) {
  return database
    .select({
      id: programmes.id,
      code: programmes.code,
      name: programmes.name,
      aircraft: programmes.aircraft,
      description: programmes.description,
      caseCount: count(cases.id),
    })
    .from(programmes)
    .leftJoin(cases, eq(cases.programmeId, programmes.id))
    .where(eq(programmes.organisationId, organisationId))
    .groupBy(programmes.id)
    .orderBy(asc(programmes.code));
}

/** A programme of the given organisation only; another organisation's id gives null, as an unknown one does. */
export async function getProgramme(organisationId: string, programmeId: string, database: Db | Tx = db) {
  if (!isUuid(programmeId)) return null;
  const [row] = await database
    .select()
    .from(programmes)
    .where(and(eq(programmes.id, programmeId), eq(programmes.organisationId, organisationId)));
  return row ?? null;
}

export async function createProgramme(input: { organisationId: string; code: string; name: string; aircraft: string; description: string; actor: Actor }, database: Db | Tx = db) {
  return database.transaction(async (tx) => {
    const [clash] = await tx
      .select({ id: programmes.id })
      .from(programmes)
      .where(and(eq(programmes.organisationId, input.organisationId), eq(programmes.code, input.code)));
    if (clash) throw new DomainError(`A programme with code ${input.code} already exists.`, { field: "code" });
    const [row] = await tx
      .insert(programmes)
      .values({ organisationId: input.organisationId, code: input.code, name: input.name, aircraft: input.aircraft, description: input.description })
      .returning();
    await writeAudit(tx, { organisationId: input.organisationId, actor: input.actor, action: "programme.create", entityType: "programme", entityId: row!.id, after: row });
    return row!;
  });
}

export async function listCases(organisationId: string, opts: { programmeId?: string; status?: CaseStatus } = {}, database: Db | Tx = db) {
  const filters = [eq(cases.organisationId, organisationId)];
  if (opts.programmeId) filters.push(eq(cases.programmeId, opts.programmeId));
  if (opts.status) filters.push(eq(cases.status, opts.status));
  return database
    .select({
      id: cases.id,
      reference: cases.reference,
      title: cases.title,
      status: cases.status,
      revision: cases.revision,
      updatedAt: cases.updatedAt,
      programmeId: programmes.id,
      programmeCode: programmes.code,
      programmeName: programmes.name,
      createdByName: users.name,
    })
    .from(cases)
    .innerJoin(programmes, eq(programmes.id, cases.programmeId))
    .innerJoin(users, eq(users.id, cases.createdBy))
    .where(and(...filters))
    .orderBy(desc(cases.updatedAt));
}

/** The case with its programme, only if it belongs to the organisation; null for a malformed id. */
function caseQuery(database: Db | Tx) {
  return database
    .select({ case: cases, programme: programmes, createdByName: users.name })
    .from(cases)
    .innerJoin(programmes, eq(programmes.id, cases.programmeId))
    .innerJoin(users, eq(users.id, cases.createdBy))
    .where(and(eq(cases.id, sql.placeholder("caseId")), eq(cases.organisationId, sql.placeholder("organisationId"))));
}

// Every page of a case makes this read: built once (see `prepared`).
const caseById = prepared((database) => caseQuery(database).prepare("case_by_id"));

export async function getCase(organisationId: string, caseId: string, database: Db | Tx = db) {
  if (!isUuid(caseId)) return null;
  const [row] = await (database === db ? caseById() : caseQuery(database)).execute({ caseId, organisationId });
  return row ?? null;
}

export async function createCase(input: { organisationId: string; programmeId: string; reference: string; title: string; description: string; actor: Actor }, database: Db | Tx = db) {
  return database.transaction(async (tx) => {
    const [programme] = await tx
      .select()
      .from(programmes)
      .where(and(eq(programmes.id, input.programmeId), eq(programmes.organisationId, input.organisationId)));
    if (!programme) throw new DomainError("Choose one of your organisation's programmes.", { field: "programmeId" });
    const [clash] = await tx
      .select({ id: cases.id })
      .from(cases)
      .where(and(eq(cases.programmeId, programme.id), eq(cases.reference, input.reference)));
    if (clash) throw new DomainError(`Programme ${programme.code} already has a case ${input.reference}.`, { field: "reference" });
    const [row] = await tx
      .insert(cases)
      .values({
        organisationId: input.organisationId,
        programmeId: programme.id,
        reference: input.reference,
        title: input.title,
        description: input.description,
        createdBy: input.actor.id,
      })
      .returning();
    await writeAudit(tx, { organisationId: input.organisationId, actor: input.actor, action: "case.create", entityType: "case", entityId: row!.id, after: row });
    return row!;
  });
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** Malformed ids answer "not found" rather than a database error. */
export function isUuid(value: string): boolean {
  return UUID.test(value);
}
