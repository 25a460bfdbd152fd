import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { compileKernel, GENERATED, generatedModule } from "./build";

describe("dense LU kernel build", () => {
  it("the committed dense-lu.wasm.ts is what the pinned AssemblyScript makes of wasm/dense-lu.ts (else: npm run build:wasm)", async () => {
    const bytes = await compileKernel();
    expect(readFileSync(GENERATED, "utf8")).toBe(generatedModule(bytes));
  }, 60_000);
});
