import type { ResultRest } from "./run";
import { resultWithCases } from "./run";
import type { ResultCase } from "./schema";

const CASES_PER_PIECE = 1000;

/**
 * The command line's JSON: `JSON.stringify(result) + "\n"`, byte for byte, built as the run goes.
 * Each case is written as soon as it is evaluated (runCaseEach) and kept only as UTF-8 bytes, a
 * thousand cases to a piece, so a sweep of 100 000 cases never holds its case objects or one string
 * of tens of megabytes. Nothing is written out before the run has succeeded (bad input writes nothing).
 */
export class ResultJson {
  #batch: string[] = [];
  #pieces: Uint8Array[] = [];
  #count = 0;

  /** Add the next case of the result. */
  addCase(c: ResultCase): void {
    this.#batch.push(JSON.stringify(c));
    if (this.#batch.length === CASES_PER_PIECE) this.#flush();
  }

  /** Write the whole document: the rest of the result with the added cases in their place. */
  writeTo(rest: ResultRest, write: (bytes: Uint8Array) => void): void {
    this.#flush();
    const text = (s: string) => write(Buffer.from(s, "utf8"));
    let first = true;
    text("{");
    for (const [key, value] of Object.entries(resultWithCases(rest, []))) {
      // JSON.stringify leaves out members whose value it cannot write (undefined).
      const json = key === "cases" ? "" : (JSON.stringify(value) as string | undefined);
      if (json === undefined) continue;
      text(`${first ? "" : ","}${JSON.stringify(key)}:`);
      first = false;
      if (key !== "cases") {
        text(json);
        continue;
      }
      text("[");
      for (const piece of this.#pieces) write(piece);
      text("]");
    }
    text("}\n");
  }

  #flush(): void {
    if (this.#batch.length === 0) return;
    this.#pieces.push(Buffer.from((this.#count ? "," : "") + this.#batch.join(","), "utf8"));
    this.#count += this.#batch.length;
    this.#batch = [];
  }
}
