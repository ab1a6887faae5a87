/**
 * JSON in one canonical form, so that the same design always hashes the same whatever order its
 * fields were written in: object members sorted by their names' UTF-16 code units, no white space,
 * strings and numbers as ECMAScript's JSON.stringify writes them (shortest round-trip numbers).
 * That is the JSON Canonicalization Scheme of RFC 8785 for the values a design holds (finite
 * numbers, strings, booleans, lists, objects). Members whose value is undefined are left out, as
 * JSON.stringify does; a non-finite number, which JSON cannot hold, is an error.
 */
export function canonicalJson(value: unknown): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'number':
      if (!Number.isFinite(value)) throw new RangeError(`canonical JSON cannot hold ${value}`);
      return JSON.stringify(value);
    case 'string':
    case 'boolean':
      return JSON.stringify(value);
    case 'object': {
      if (Array.isArray(value)) return `[${value.map((item) => (item === undefined ? 'null' : canonicalJson(item))).join(',')}]`;
      if (ArrayBuffer.isView(value)) return canonicalJson(Array.from(value as unknown as ArrayLike<number>));
      const record = value as Record<string, unknown>;
      const names = Object.keys(record)
        .filter((name) => record[name] !== undefined)
        .sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
      return `{${names.map((name) => `${JSON.stringify(name)}:${canonicalJson(record[name])}`).join(',')}}`;
    }
    default:
      throw new TypeError(`canonical JSON cannot hold a ${typeof value}`);
  }
}
