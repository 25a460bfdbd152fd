import { describe, expect, it } from "vitest";
import { describeCaseEvent } from "./steps";

describe("case history in words", () => {
  it("names the step and what happened to it", () => {
    expect(describeCaseEvent("step.planform.save")).toBe("Planform saved");
    expect(describeCaseEvent("step.loads.submit")).toBe("Loads submitted for check");
    expect(describeCaseEvent("step.basis.return")).toBe("Basis returned to the engineer");
    expect(describeCaseEvent("case.approve-for-issue")).toBe("Case approved for issue");
  });

  it("shows an action it has no words for exactly as recorded", () => {
    expect(describeCaseEvent("step.wingbox.save")).toBe("step.wingbox.save");
    expect(describeCaseEvent("report.something-new")).toBe("report.something-new");
  });
});
