import { and, eq } from "drizzle-orm";
import { parseSectionCsv, sectionsWithUpload, type SectionCsvResult } from "~/domain/section-csv";
import type { SectionsData } from "~/domain/step-data";
import { sha256Hex, writeAudit } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { uploads } from "~/db/schema";
import { env } from "~/utils/env.server";
import { getObjectBytes, putObject } from "./storage.server";
import { DomainError } from "~/domain/errors";
import type { Actor } from "~/domain/people";


/**
 * Receives a section-data CSV: parses it first and stores nothing if any row is bad; a good file
 * is kept whole in S3 under its SHA-256, with a database record, so the accepted data can always
 * be traced to the exact bytes received.
 */
export async function receiveSectionCsv(input: { organisationId: string; caseId: string; filename: string; bytes: Uint8Array; actor: Actor }, database: Db | Tx = db) {
  const parsed = parseSectionCsv(input.bytes);
  if (!parsed.ok) return { parsed, upload: null };
  const sha256 = sha256Hex(input.bytes);
  const bucket = env().S3_BUCKET_UPLOADS;
  const key = `cases/${input.caseId}/sections/${sha256}.csv`;
  await putObject(bucket, key, input.bytes, "text/csv", sha256);
  const upload = await database.transaction(async (tx) => {
    const [row] = await tx
      .insert(uploads)
      .values({ organisationId: input.organisationId, caseId: input.caseId, bucket, key, filename: input.filename.slice(0, 200), contentType: "text/csv", size: input.bytes.byteLength, sha256, createdBy: input.actor.id })
      .returning();
    await writeAudit(tx, { organisationId: input.organisationId, actor: input.actor, action: "upload.sections", entityType: "case", entityId: input.caseId, after: { uploadId: row!.id, filename: row!.filename, sha256, size: row!.size } });
    return row!;
  });
  return { parsed, upload };
}

/** Re-reads an upload of this case from S3 and parses it again, checking the bytes against the recorded hash. */
export async function readSectionUpload(caseId: string, uploadId: string, database: Db | Tx = db): Promise<{ upload: typeof uploads.$inferSelect; parsed: SectionCsvResult } | null> {
  const [upload] = await database.select().from(uploads).where(and(eq(uploads.id, uploadId), eq(uploads.caseId, caseId)));
  if (!upload) return null;
  const bytes = await getObjectBytes(upload.bucket, upload.key);
  if (sha256Hex(bytes) !== upload.sha256) throw new Error(`stored file ${upload.key} does not match its recorded SHA-256`);
  return { upload, parsed: parseSectionCsv(bytes) };
}

/**
 * The section data of an upload of this case, for the sections step: a coefficient or polar file's rows
 * and fitted tables, with the file named and its SHA-256 as the data's source; a chordwise pressure file's
 * pressures added to the saved rows at the same y.
 * @throws DomainError (field uploadId) when the upload is not this case's, its file no longer parses, or a
 * pressure file names a station the saved data do not have
 */
export async function sectionsFromUpload(caseId: string, uploadId: string, saved: SectionsData | null) {
  const found = await readSectionUpload(caseId, uploadId);
  if (!found || !found.parsed.ok) throw new DomainError("That upload was not found for this case; upload the file again.", { field: "uploadId" });
  const { upload, parsed } = found;
  const merged = sectionsWithUpload(saved, parsed, { kind: "upload", uploadId: upload.id, filename: upload.filename, sha256: upload.sha256 });
  if ("problem" in merged) throw new DomainError(merged.problem, { field: "uploadId" });
  return merged.data;
}

/** The saved section data without their chordwise pressures (the rule then scales at Cp,min again). */
export function sectionsWithoutPressures(saved: SectionsData | null) {
  if (!saved) throw new DomainError("There are no saved section data.", { field: "form" });
  return { ...saved, rows: saved.rows.map(({ pressures: _pressures, ...r }) => r) };
}
