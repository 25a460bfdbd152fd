import { describe, expect, it } from "vitest";
import { EngineError, isEngineError } from "./errors";

describe("EngineError", () => {
  it("carries code, field and a message naming the field", () => {
    const e = new EngineError("mach-out-of-range", "must be below 1 (subsonic rules only)", "cases[3].mach");
    expect(e.code).toBe("mach-out-of-range");
    expect(e.field).toBe("cases[3].mach");
    expect(e.message).toBe("cases[3].mach: must be below 1 (subsonic rules only)");
    expect(isEngineError(e)).toBe(true);
    expect(isEngineError(new Error("x"))).toBe(false);
  });
});
