/**
 * Disjoint sets (union-find) with union by size and path halving, to turn the pairs of
 * strongly associated features into connected components (clusters). Free source: R. E. Tarjan,
 * "Efficiency of a good but not linear set union algorithm", JACM 22(2), 1975; summarised at
 * https://en.wikipedia.org/wiki/Disjoint-set_data_structure.
 */
export class UnionFind {
  private readonly parent: Int32Array;
  private readonly size: Int32Array;
  constructor(n: number) {
    this.parent = Int32Array.from({ length: n }, (_, i) => i);
    this.size = new Int32Array(n).fill(1);
  }
  find(x: number): number {
    const p = this.parent;
    while (p[x] !== x) {
      p[x] = p[p[x]];
      x = p[x];
    }
    return x;
  }
  union(a: number, b: number): void {
    let ra = this.find(a);
    let rb = this.find(b);
    if (ra === rb) return;
    if (this.size[ra] < this.size[rb]) [ra, rb] = [rb, ra];
    this.parent[rb] = ra;
    this.size[ra] += this.size[rb];
  }
  /** The components with at least `min` members, each ascending, ordered by smallest member. */
  components(min = 1): number[][] {
    const byRoot = new Map<number, number[]>();
    for (let i = 0; i < this.parent.length; i++) {
      const r = this.find(i);
      const list = byRoot.get(r);
      if (list) list.push(i);
      else byRoot.set(r, [i]);
    }
    return [...byRoot.values()].filter((c) => c.length >= min).sort((a, b) => a[0] - b[0]);
  }
}
