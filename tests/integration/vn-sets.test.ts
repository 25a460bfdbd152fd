import { describe, expect, it, vi } from "vitest";
import * as engine from "~/engine";
import { loader as envelopeLoader } from "~/routes/cases/envelope";
import { caseInputs } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { vnSets } from "~/services/envelope.server";
import { request, run, withSeededDemoCase } from "./helpers";

// Every spanwise solve goes through the engine's solveMach: counted here, so the test sees what the
// V–n page's loader does on each request (issue 10 item 8: the envelope page answers fast).
vi.mock("~/engine", async (importOriginal) => {
  const actual = await importOriginal<typeof engine>();
  return { ...actual, solveMach: vi.fn(actual.solveMach) };
});
const solves = () => vi.mocked(engine.solveMach).mock.calls.length;

let caseId = "";
let cookie = "";

withSeededDemoCase((demo) => ({ caseId, cookie } = demo));

describe("the V–n diagrams are worked out once per content of their inputs", () => {
  it("a second request of the V–n page solves nothing and shows the same diagrams", async () => {
    const first = await run(envelopeLoader, { request: request(`/cases/${caseId}/envelope`, { cookie }), params: { caseId } });
    expect(first.status).toBe(200);
    const before = solves();
    const second = await run(envelopeLoader, { request: request(`/cases/${caseId}/envelope`, { cookie }), params: { caseId } });
    expect(solves()).toBe(before);
    expect((second.body as { sets: unknown[] }).sets).toEqual((first.body as { sets: unknown[] }).sets);
    expect((second.body as { sets: unknown[] }).sets.length).toBeGreaterThan(0);
  });

  it("other inputs are worked out afresh, and a caller cannot change what the next one is handed", async () => {
    const inputs = caseInputs(await getCaseSteps(caseId));
    const method = { compressibility: "prandtl-glauert", spanwise: "lifting-line" } as const;
    const sets = vnSets(inputs.basis!, inputs.planform!, inputs.sections!, method, inputs.masses);
    const before = solves();
    // A higher VC moves the VC points and their gust Mach number (common practice, no source): new inputs, new solves.
    const faster = { ...inputs.basis!, vc: inputs.basis!.vc * 1.02 };
    const changed = vnSets(faster, inputs.planform!, inputs.sections!, method, inputs.masses);
    expect(solves()).toBeGreaterThan(before);
    expect(changed).not.toEqual(sets);
    const handed = vnSets(inputs.basis!, inputs.planform!, inputs.sections!, method, inputs.masses);
    handed.length = 0;
    expect(vnSets(inputs.basis!, inputs.planform!, inputs.sections!, method, inputs.masses)).toEqual(sets);
  });
});
