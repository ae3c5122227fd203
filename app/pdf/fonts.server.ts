/**
 * Source Sans 3 for PDFs, from the .woff files @fontsource ships (WOFF2 crashes
 * @react-pdf/renderer: shared/STACK.md, "PDF fonts"). Registered once per process.
 */
import { createRequire } from "node:module";
import { Font } from "@react-pdf/renderer";

export const PDF_FONT = "Source Sans 3";
/** Each @fontsource file is one Unicode subset: latin-ext carries names such as Łukasz or Zoë. */
const PDF_FONT_EXT = "Source Sans 3 Latin Extended";
/** The family list to style text with: latin first, latin-ext for the characters it lacks. */
export const PDF_FONT_FAMILY = [PDF_FONT, PDF_FONT_EXT];
let registered = false;

export function registerPdfFonts(): void {
  if (registered) return;
  const require = createRequire(import.meta.url);
  const file = (subset: string, weight: number) => require.resolve(`@fontsource/source-sans-3/files/source-sans-3-${subset}-${weight}-normal.woff`);
  for (const [family, subset] of [
    [PDF_FONT, "latin"],
    [PDF_FONT_EXT, "latin-ext"],
  ] as const) {
    Font.register({ family, fonts: [{ src: file(subset, 400), fontWeight: 400 }, { src: file(subset, 600), fontWeight: 600 }] });
  }
  // Words are never hyphenated in a signed record.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}

/**
 * Zero-width space (U+200B) and the byte-order mark / zero-width no-break space (U+FEFF) crash
 * the renderer ("Offset is outside the bounds of the DataView" in fontkit: the latin .woff maps
 * them to a glyph it cannot read). Both are invisible, so they are left out of every string a PDF
 * draws; nothing visible changes. Plain objects and arrays are copied; other values are kept.
 */
const UNDRAWABLE = /[\u200B\uFEFF]/g;
export function drawableText<T>(value: T): T {
  if (typeof value === "string") return value.replace(UNDRAWABLE, "") as T;
  if (Array.isArray(value)) return value.map((v) => drawableText(v)) as T;
  if (value && typeof value === "object" && Object.getPrototypeOf(value) === Object.prototype) {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, drawableText(v)])) as T;
  }
  return value;
}
