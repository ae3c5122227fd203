/**
 * Making invisible characters visible in the roster preview, so an admin sees a zero-width
 * space or a right-to-left override an HR cell carries before it is stored. The text itself is
 * stored verbatim; React escapes markup when it is drawn. Pure.
 *
 * Marked: C0 and C1 control characters (except none: a tab or line break inside a name is
 * suspicious too), the soft hyphen U+00AD, the Arabic letter mark U+061C, U+180E, the
 * zero-width and directional marks U+200B–U+200F, the bidirectional embeddings and overrides
 * U+202A–U+202E, word joiner and invisible operators U+2060–U+2064, the isolates
 * U+2066–U+2069, and the byte-order mark / zero-width no-break space U+FEFF (Unicode Standard
 * Annex #9, "Unicode Bidirectional Algorithm", §2 explicit formatting characters; Unicode
 * Technical Standard #39, "Unicode Security Mechanisms", on invisible and bidi characters).
 */
const INVISIBLE = /[\u0000-\u001F\u007F-\u009F\u00AD\u061C\u180E\u200B-\u200F\u202A-\u202E\u2060-\u2064\u2066-\u2069\uFEFF]/u;

export type TextPiece = { text: string; invisible: boolean };

/** U+200B style name of one character. */
export function codePointLabel(ch: string): string {
  return `U+${(ch.codePointAt(0) ?? 0).toString(16).toUpperCase().padStart(4, "0")}`;
}

/** Splits text into plain runs and single invisible characters, each of those shown as ⟨U+200B⟩. */
export function markInvisible(value: string): TextPiece[] {
  const pieces: TextPiece[] = [];
  let run = "";
  for (const ch of value) {
    if (INVISIBLE.test(ch)) {
      if (run) pieces.push({ text: run, invisible: false });
      run = "";
      pieces.push({ text: `⟨${codePointLabel(ch)}⟩`, invisible: true });
    } else run += ch;
  }
  if (run) pieces.push({ text: run, invisible: false });
  return pieces;
}

export function hasInvisible(value: string): boolean {
  for (const ch of value) if (INVISIBLE.test(ch)) return true;
  return false;
}
