import { marked } from "marked";
// The same text as docs/exchange-format.md in the repository, bundled because docs/ is not served.
import exchangeFormat from "../../docs/exchange-format.md?raw";

let html: string | undefined;

/** docs/exchange-format.md as HTML, rendered once: the file is ours and fixed at build time. */
export function exchangeFormatHtml(): string {
  // Code blocks scroll sideways: focusable, so a keyboard can scroll them too (WCAG 2.1.1).
  html ??= marked.parse(exchangeFormat, { async: false, gfm: true }).replaceAll("<pre>", '<pre tabindex="0">');
  return html;
}
