/**
 * The rows a table shows, as a list of indices into its columns (one entry per node, edge or
 * hazard): filtered and sorted without an object per row.
 */

/** The indices `0 … count-1` that `keep` keeps, in order. */
export function filterRows(count: number, keep: ((i: number) => boolean) | null): Uint32Array {
  const out = new Uint32Array(count);
  if (!keep) {
    for (let i = 0; i < count; i++) out[i] = i;
    return out;
  }
  let k = 0;
  for (let i = 0; i < count; i++) if (keep(i)) out[k++] = i;
  return out.slice(0, k);
}

const DIGITS = /\d+/g;

/**
 * A string that sorts as `text` sorts naturally, by plain comparison: case folded and each run of
 * digits padded to one width, so `A2` comes before `A10`.
 */
export function naturalKey(text: string): string {
  return text.toLowerCase().replace(DIGITS, (run) => run.padStart(16, '0'));
}

/**
 * Each index's rank among `count` values (equal values share a rank): numbers by size, strings in
 * natural order (see naturalKey). Made once per column, so sorting a list of indices compares ranks.
 */
export function ranksAmong(count: number, value: (i: number) => number | string): Uint32Array {
  const ranks = new Uint32Array(count);
  if (count === 0) return ranks;
  const numeric = typeof value(0) === 'number';
  const keys: (number | string)[] = new Array(count);
  for (let i = 0; i < count; i++) {
    const v = value(i);
    keys[i] = numeric ? v : naturalKey(String(v));
  }
  const order = Array.from({ length: count }, (_, i) => i);
  order.sort((a, b) => (keys[a] < keys[b] ? -1 : keys[a] > keys[b] ? 1 : a - b));
  let rank = 0;
  for (let j = 0; j < count; j++) {
    if (j > 0 && keys[order[j]] !== keys[order[j - 1]]) rank++;
    ranks[order[j]] = rank;
  }
  return ranks;
}

/** `rows` sorted by rank, rising or falling; rows of equal rank keep their order. */
export function sortRows(rows: Uint32Array, ranks: Uint32Array, descending: boolean): Uint32Array {
  const sign = descending ? -1 : 1;
  return rows.slice().sort((a, b) => sign * (ranks[a] - ranks[b]) || a - b);
}
