/**
 * The few pieces of HTML writing the report needs. Every text and attribute from the data goes
 * through `escapeHtml`: names, notes and labels are always text, never markup. Markup is only ever
 * written by this program's own code.
 */

// eslint-disable-next-line no-control-regex
const NOT_TEXT = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/gu;

export function escapeHtml(text: string): string {
  return text.replace(NOT_TEXT, '\uFFFD').replace(/&/gu, '&amp;').replace(/</gu, '&lt;').replace(/>/gu, '&gt;').replace(/"/gu, '&quot;').replace(/'/gu, '&#39;');
}

/** Attributes as ` name="value"`, undefined ones left out. Names are the program's own. */
export function attributes(values: Readonly<Record<string, string | number | boolean | undefined>>): string {
  let out = '';
  for (const [name, value] of Object.entries(values)) {
    if (value === undefined || value === false) continue;
    if (!/^[a-z][a-z0-9-]*$/u.test(name)) throw new RangeError(`not an attribute name: ${name}`);
    out += value === true ? ` ${name}` : ` ${name}="${escapeHtml(String(value))}"`;
  }
  return out;
}

/** An element with escaped text content. */
export function element(tag: string, attrs: Readonly<Record<string, string | number | boolean | undefined>>, text: string): string {
  return `<${tag}${attributes(attrs)}>${escapeHtml(text)}</${tag}>`;
}
