/**
 * The growing node arrays of a forest (or a single tree): trees are appended one after another
 * with global node indices, so the finished arrays are the model's flat form with no copy per
 * tree. Fresh memory is costly (every new page is faulted in and zeroed), so after the first
 * tree `expect` sizes the arrays for the whole forest from it; beyond that, `reserve` doubles.
 */
/** Bytes of one node: feature, left, right, offset (Int32) and threshold (Float64). */
export const NODE_BYTES = 4 * 4 + 8;

export class NodeStore {
  feature: Int32Array;
  threshold: Float64Array;
  left: Int32Array;
  right: Int32Array;
  offset: Int32Array;
  values: Float64Array;
  count = 0;
  valueCount = 0;
  readonly roots: number[] = [];
  /** per feature: sum over trees of the impurity decreases divided by the tree's root weight */
  readonly importance: Float64Array;

  constructor(featureCount: number, nodeCapacity = 1024, valueCapacity = 1024) {
    this.feature = new Int32Array(nodeCapacity);
    this.threshold = new Float64Array(nodeCapacity);
    this.left = new Int32Array(nodeCapacity);
    this.right = new Int32Array(nodeCapacity);
    this.offset = new Int32Array(nodeCapacity);
    this.values = new Float64Array(valueCapacity);
    this.importance = new Float64Array(featureCount);
  }

  /** Makes room for `nodes` more nodes and `values` more leaf values. */
  reserve(nodes: number, values: number): void {
    const needNodes = this.count + nodes;
    if (needNodes > this.feature.length) {
      const cap = Math.max(needNodes, 2 * this.feature.length);
      const ints = (a: Int32Array) => {
        const b = new Int32Array(cap);
        b.set(a.subarray(0, this.count));
        return b;
      };
      const t = new Float64Array(cap);
      t.set(this.threshold.subarray(0, this.count));
      this.threshold = t;
      this.feature = ints(this.feature);
      this.left = ints(this.left);
      this.right = ints(this.right);
      this.offset = ints(this.offset);
    }
    const needValues = this.valueCount + values;
    if (needValues > this.values.length) {
      const cap = Math.max(needValues, 2 * this.values.length);
      const v = new Float64Array(cap);
      v.set(this.values.subarray(0, this.valueCount));
      this.values = v;
    }
  }

  /**
   * Sizes the arrays for `moreTrees` more trees like the ones stored so far (plus a margin), so
   * that the rest of the forest needs no regrowth and no copy.
   */
  expect(moreTrees: number): void {
    const trees = Math.max(1, this.roots.length);
    const margin = (k: number) => Math.ceil((k / trees) * moreTrees * 1.1);
    this.reserve(margin(this.count), margin(this.valueCount));
  }

  /**
   * Forgets every stored tree and keeps the arrays' room, for a forest that predicts each tree's
   * rows as it grows and keeps no model (fitCartOnFold). The importance sums are kept.
   */
  clear(): void {
    this.count = 0;
    this.valueCount = 0;
    this.roots.length = 0;
  }

  /** Bytes of the nodes and leaf values stored so far. */
  bytes(): number {
    return this.count * NODE_BYTES + this.valueCount * 8;
  }

  /** A new leaf-shaped node (room must have been reserved). */
  add(): number {
    const id = this.count++;
    this.feature[id] = -1;
    this.threshold[id] = 0;
    this.left[id] = -1;
    this.right[id] = -1;
    this.offset[id] = -1;
    return id;
  }

  /** Offset of k new leaf values (room must have been reserved). */
  addValues(k: number): number {
    const at = this.valueCount;
    this.valueCount += k;
    return at;
  }

  /** The used part of an array: a view when it fills most of it, else a compact copy. */
  static used<T extends Int32Array | Float64Array>(a: T, n: number): T {
    return (4 * n >= 3 * a.length ? a.subarray(0, n) : a.slice(0, n)) as T;
  }
}
