// Strongly connected components of a directed graph on nodes 0..n−1 (Tarjan), used to test and
// to enforce weak reversibility of a candidate realization.

export function strongComponents(nodeCount: number, edges: readonly [number, number][]): number[] {
  const next = Array.from({ length: nodeCount }, () => [] as number[]);
  for (const [from, to] of edges) next[from].push(to);
  const component = new Array<number>(nodeCount).fill(-1);
  const index = new Array<number>(nodeCount).fill(-1);
  const low = new Array<number>(nodeCount).fill(0);
  const stack: number[] = [];
  const onStack = new Array<boolean>(nodeCount).fill(false);
  let counter = 0;
  let components = 0;
  const visit = (v: number) => {
    index[v] = low[v] = counter++;
    stack.push(v);
    onStack[v] = true;
    for (const w of next[v]) {
      if (index[w] < 0) {
        visit(w);
        low[v] = Math.min(low[v], low[w]);
      } else if (onStack[w]) low[v] = Math.min(low[v], index[w]);
    }
    if (low[v] === index[v]) {
      let w: number;
      do {
        w = stack.pop()!;
        onStack[w] = false;
        component[w] = components;
      } while (w !== v);
      components++;
    }
  };
  for (let v = 0; v < nodeCount; v++) if (index[v] < 0) visit(v);
  return component;
}

/** Weakly reversible: every reaction lies in a strong component, i.e. on a directed cycle. */
export function isWeaklyReversible(nodeCount: number, edges: readonly [number, number][]): boolean {
  const component = strongComponents(nodeCount, edges);
  return edges.every(([from, to]) => component[from] === component[to]);
}
