import type { ResultRest } from "./run";
import { resultWithCases } from "./run";
import type { ResultCase } from "./schema";

/** Bytes of one piece of the cases' text: a sweep of 100 000 summary cases takes about fifty. */
export const PIECE_BYTES = 1 << 20;
const COMMA = 0x2c;

/**
 * The command line's JSON: `JSON.stringify(result) + "\n"`, byte for byte, built as the run goes.
 * Each case is written as soon as it is evaluated (runCaseEach) straight into pieces of UTF-8 bytes,
 * so a sweep of 100 000 cases never holds its case objects or one string of tens of megabytes.
 * Nothing is written out before the run has succeeded (bad input writes nothing).
 */
export class ResultJson {
  #pieces: Buffer[] = [];
  #piece = Buffer.allocUnsafe(PIECE_BYTES);
  #used = 0;
  #count = 0;

  /** Add the next case of the result. */
  addCase(c: ResultCase): void {
    const text = JSON.stringify(c);
    // A UTF-16 code unit takes at most three bytes of UTF-8; one more for the comma.
    if (this.#used + 3 * text.length + 1 > this.#piece.length) {
      this.#pieces.push(this.#piece.subarray(0, this.#used));
      this.#piece = Buffer.allocUnsafe(Math.max(PIECE_BYTES, 3 * text.length + 1));
      this.#used = 0;
    }
    if (this.#count++) this.#piece[this.#used++] = COMMA;
    this.#used += this.#piece.write(text, this.#used);
  }

  /** Write the whole document: the rest of the result with the added cases in their place. */
  writeTo(rest: ResultRest, write: (bytes: Uint8Array) => void): void {
    const pieces = [...this.#pieces, this.#piece.subarray(0, this.#used)];
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
      for (const piece of pieces) if (piece.length) write(piece);
      text("]");
    }
    text("}\n");
  }
}
