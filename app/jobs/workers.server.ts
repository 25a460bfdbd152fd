import { computeQueuedResults } from "~/services/analysis.server";
import { runAnalysisJob } from "~/services/analysis-jobs.server";
import { anchorAllChains } from "~/services/audit-trail.server";
import { generateReport } from "~/services/reports.server";
import { runRerun } from "~/services/reproduction.server";
import { computeRuleSensitivity } from "~/services/rule-sensitivity.server";
import { AUDIT_CHECKPOINT_CRON, boss, QUEUES } from "./boss.server";

/**
 * Registers every job handler. Handlers re-load their record by id and are idempotent, so a retried
 * or duplicated job does no harm; any number of worker processes may share one database.
 */
export async function startWorkers(): Promise<void> {
  const queue = await boss();
  await queue.work<{ reportId: string }>(QUEUES.generateReport, { includeMetadata: true, pollingIntervalSeconds: 1 }, async ([job]) => {
    if (!job) return;
    await generateReport(job.data.reportId, { retryCount: job.retryCount, retryLimit: job.retryLimit });
  });
  await queue.work<{ caseId: string; scope?: "envelope" | "final" }>(QUEUES.computeResults, { pollingIntervalSeconds: 1 }, async ([job]) => {
    if (job) await computeQueuedResults(job.data.caseId, undefined, job.data.scope);
  });
  await queue.work<{ jobId: string }>(QUEUES.analyze, { pollingIntervalSeconds: 1 }, async ([job]) => {
    if (job) await runAnalysisJob(job.data.jobId);
  });
  await queue.work<{ rerunId: string }>(QUEUES.rerunReport, { pollingIntervalSeconds: 1 }, async ([job]) => {
    if (job) await runRerun(job.data.rerunId);
  });
  await queue.work<{ caseId: string; inputHash: string }>(QUEUES.ruleSensitivity, { pollingIntervalSeconds: 1 }, async ([job]) => {
    if (job) await computeRuleSensitivity(job.data.caseId, job.data.inputHash);
  });
  await queue.work(QUEUES.auditCheckpoint, async () => {
    await anchorAllChains();
  });
  await queue.schedule(QUEUES.auditCheckpoint, AUDIT_CHECKPOINT_CRON, {}, { singletonKey: "audit-checkpoint" });
}
