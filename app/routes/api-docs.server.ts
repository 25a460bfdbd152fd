import { marked } from "marked";
// The same text as docs/exchange-format.md in the repository, bundled because docs/ is not served.
import exchangeFormat from "../../docs/exchange-format.md?raw";

let html: string | undefined;

/** docs/exchange-format.md as HTML, rendered once: the file is ours and fixed at build time. */
export function exchangeFormatHtml(): string {
  html ??= marked.parse(exchangeFormat, { async: false, gfm: true });
  return html;
}
