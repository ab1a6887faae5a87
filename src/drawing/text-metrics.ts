/**
 * Text width without a DOM: the drawings are laid out in Node (the report) as well as on the page,
 * so there is no measureText. Widths are estimated from per-character advance classes of a common
 * sans-serif face, in ems; generous rather than tight, so an estimate never overlaps what follows.
 */

const NARROW = new Set([...'iljI.,:;|!\'`·']);
const SEMI_NARROW = new Set([...'frt()[]{}-/ ']);
const WIDE = new Set([...'mwMW@%—']);
const CAPITAL_OR_ROUND = /[A-Z0-9ΩµÅ&#+=<>?~$€]/u;

/** Estimated advance of one character, in ems. */
function advance(character: string): number {
  if (NARROW.has(character)) return 0.3;
  if (SEMI_NARROW.has(character)) return 0.38;
  if (WIDE.has(character)) return 0.86;
  if (CAPITAL_OR_ROUND.test(character)) return 0.66;
  return 0.56;
}

/** Estimated width of `text` at `fontSizePx` (bold adds 6 %). */
export function textWidth(text: string, fontSizePx: number, bold = false): number {
  let ems = 0;
  for (const character of text) ems += advance(character);
  return ems * fontSizePx * (bold ? 1.06 : 1);
}

/** Words filled into lines no wider than `maxWidthPx`; a word longer than a line is cut with "…". */
export function wrapText(text: string, maxWidthPx: number, fontSizePx: number): string[] {
  const lines: string[] = [];
  let line = '';
  // Split at ordinary white space only: a no-break space holds a value to its unit.
  for (const word of text.split(/[ \t\n\r]+/u).filter((w) => w !== '')) {
    const candidate = line === '' ? word : `${line} ${word}`;
    if (textWidth(candidate, fontSizePx) <= maxWidthPx || line === '') {
      line = textWidth(candidate, fontSizePx) <= maxWidthPx ? candidate : truncateText(candidate, maxWidthPx, fontSizePx);
    } else {
      lines.push(line);
      line = textWidth(word, fontSizePx) <= maxWidthPx ? word : truncateText(word, maxWidthPx, fontSizePx);
    }
  }
  if (line !== '') lines.push(line);
  return lines;
}

/** `text` cut to fit `maxWidthPx`, ending in "…" when cut. */
export function truncateText(text: string, maxWidthPx: number, fontSizePx: number): string {
  if (textWidth(text, fontSizePx) <= maxWidthPx) return text;
  const characters = [...text];
  while (characters.length > 0 && textWidth(`${characters.join('')}…`, fontSizePx) > maxWidthPx) characters.pop();
  return `${characters.join('').trimEnd()}…`;
}
