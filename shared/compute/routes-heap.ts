/**
 * Binary min-heap of int items on typed arrays, ordered by (k1, k2) lexicographically.
 * Duplicates are allowed (lazy deletion is the caller's business), so no position index is kept.
 */
export class MinHeap {
  size = 0;
  private items: Int32Array;
  private k1: Float64Array;
  private k2: Float64Array;

  constructor(capacity = 1024) {
    this.items = new Int32Array(capacity);
    this.k1 = new Float64Array(capacity);
    this.k2 = new Float64Array(capacity);
  }

  clear(): void {
    this.size = 0;
  }

  get byteLength(): number {
    return this.items.byteLength + this.k1.byteLength + this.k2.byteLength;
  }

  private grow(): void {
    const cap = this.items.length * 2;
    const items = new Int32Array(cap);
    const k1 = new Float64Array(cap);
    const k2 = new Float64Array(cap);
    items.set(this.items);
    k1.set(this.k1);
    k2.set(this.k2);
    this.items = items;
    this.k1 = k1;
    this.k2 = k2;
  }

  push(item: number, key1: number, key2 = 0): void {
    if (this.size === this.items.length) this.grow();
    const items = this.items;
    const k1 = this.k1;
    const k2 = this.k2;
    let i = this.size++;
    while (i > 0) {
      const p = (i - 1) >> 1;
      const pk = k1[p];
      if (pk < key1 || (pk === key1 && k2[p] <= key2)) break;
      items[i] = items[p];
      k1[i] = pk;
      k2[i] = k2[p];
      i = p;
    }
    items[i] = item;
    k1[i] = key1;
    k2[i] = key2;
  }

  /** Key of the top item; only valid when size > 0. */
  topKey1(): number {
    return this.k1[0];
  }

  /** Second key of the top item; only valid when size > 0. */
  topKey2(): number {
    return this.k2[0];
  }

  pop(): number {
    const items = this.items;
    const k1 = this.k1;
    const k2 = this.k2;
    const top = items[0];
    const n = --this.size;
    if (n === 0) return top;
    const item = items[n];
    const key1 = k1[n];
    const key2 = k2[n];
    let i = 0;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      const r = c + 1;
      if (r < n && (k1[r] < k1[c] || (k1[r] === k1[c] && k2[r] < k2[c]))) c = r;
      if (key1 < k1[c] || (key1 === k1[c] && key2 <= k2[c])) break;
      items[i] = items[c];
      k1[i] = k1[c];
      k2[i] = k2[c];
      i = c;
    }
    items[i] = item;
    k1[i] = key1;
    k2[i] = key2;
    return top;
  }
}
