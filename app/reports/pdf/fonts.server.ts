import { createRequire } from "node:module";
import unicodeRanges from "@fontsource/source-sans-3/unicode.json";

/**
 * @fontsource ships Source Sans 3 as unicode-range subsets: the latin file has no ł, ż, ć, the
 * latin-ext file has almost no basic Latin, and pdfkit has no glyph fallback. So every string is
 * cut into runs by the subset whose published range holds each character, and each run is set in
 * that subset's face. Greek is registered for α, β in headers and method names.
 */
export const SUBSETS = ["latin", "latin-ext", "greek"] as const;
export type Subset = (typeof SUBSETS)[number];
export type Weight = 400 | 600;

const RANGES: Record<Subset, [number, number][]> = Object.fromEntries(
  SUBSETS.map((s) => [
    s,
    (unicodeRanges as Record<string, string>)[s]!.split(",").map((r) => {
      const [a, b] = r.replace(/^U\+/, "").split("-");
      return [parseInt(a!, 16), parseInt(b ?? a!, 16)] as [number, number];
    }),
  ]),
) as Record<Subset, [number, number][]>;

function subsetOf(cp: number): Subset {
  for (const s of SUBSETS) if (RANGES[s].some(([a, b]) => cp >= a && cp <= b)) return s;
  // Outside every registered subset: the latin face draws its missing-glyph box.
  return "latin";
}

/** The text cut into runs of one subset each, in order. */
export function fontRuns(text: string): { subset: Subset; text: string }[] {
  const out: { subset: Subset; text: string }[] = [];
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    // Spaces and combining marks stay with the run they are in.
    const s = out.length > 0 && (cp === 0x20 || cp === 0x0304 || cp === 0x0308) ? out[out.length - 1]!.subset : subsetOf(cp);
    const last = out[out.length - 1];
    if (last && last.subset === s) last.text += ch;
    else out.push({ subset: s, text: ch });
  }
  return out;
}

export const face = (weight: Weight, subset: Subset, italic = false) => `SS3-${weight}${italic ? "i" : ""}-${subset}`;

export function registerFonts(doc: PDFKit.PDFDocument) {
  const require = createRequire(import.meta.url);
  for (const subset of SUBSETS) {
    for (const weight of [400, 600] as const) {
      for (const italic of [false, true]) {
        const file = require.resolve(`@fontsource/source-sans-3/files/source-sans-3-${subset}-${weight}-${italic ? "italic" : "normal"}.woff`);
        doc.registerFont(face(weight, subset, italic), file);
      }
    }
  }
}

/**
 * SVG text is given the same treatment: text holding characters outside the latin subset is cut
 * into tspans naming the subset, which the font callback below maps to the registered face.
 */
export function splitSvgText(svg: string): string {
  return svg.replace(/(<text\b[^>]*>)([^<]*)(<\/text>)/g, (_whole, tag: string, content: string, close: string) => {
    // svg-to-pdfkit ignores paint-order, so a label's white halo would be painted over its fill.
    const open = /paint-order="stroke"/.test(tag) ? tag.replace(/ stroke(-width|-opacity|-miterlimit)?="[^"]*"/g, "") : tag;
    const runs = fontRuns(content);
    if (runs.length === 1 && runs[0]!.subset === "latin") return open + content + close;
    return open + runs.map((r) => `<tspan style="font-family:SS3-${r.subset}">${r.text}</tspan>`).join("") + close;
  });
}

export function svgFont(family: string, bold: boolean, italic: boolean): string {
  const m = /SS3-(latin-ext|latin|greek)/.exec(family);
  return face(bold ? 600 : 400, (m?.[1] as Subset | undefined) ?? "latin", italic);
}
