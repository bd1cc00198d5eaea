// The complex graph: linkage classes (connected components of the undirected graph), strong
// linkage classes (strongly connected components) and the terminal ones (no reaction leaves them).
// Classes are listed by their smallest complex index, each sorted ascending.

export interface Edge {
  from: number;
  to: number;
}

export interface Linkage {
  linkageClasses: number[][];
  strongLinkageClasses: number[][];
  terminalStrongLinkageClasses: number[][];
  /** linkageClassOf[complex] is the index of its linkage class. */
  linkageClassOf: number[];
}

export function analyzeLinkage(complexCount: number, edges: Edge[]): Linkage {
  const linkageClassOf = connectedComponents(complexCount, edges);
  const linkageClasses = groups(linkageClassOf);
  const strongOf = strongComponents(complexCount, edges);
  const strongLinkageClasses = groups(strongOf);
  const leaves = new Set<number>();
  for (const { from, to } of edges) if (strongOf[from] !== strongOf[to]) leaves.add(strongOf[from]);
  const terminalStrongLinkageClasses = strongLinkageClasses.filter((members) => !leaves.has(strongOf[members[0]]));
  return { linkageClasses, strongLinkageClasses, terminalStrongLinkageClasses, linkageClassOf };
}

/** Renumbers component labels by first member and lists the members of each. */
function groups(componentOf: number[]): number[][] {
  const renumbered = new Map<number, number>();
  const result: number[][] = [];
  componentOf.forEach((component, node) => {
    let index = renumbered.get(component);
    if (index === undefined) {
      index = result.push([]) - 1;
      renumbered.set(component, index);
    }
    result[index].push(node);
  });
  componentOf.forEach((component, node) => (componentOf[node] = renumbered.get(component)!));
  return result;
}

function connectedComponents(count: number, edges: Edge[]): number[] {
  const parent = Array.from({ length: count }, (_, index) => index);
  const find = (node: number): number => {
    while (parent[node] !== node) node = parent[node] = parent[parent[node]];
    return node;
  };
  for (const { from, to } of edges) {
    const a = find(from);
    const b = find(to);
    if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
  }
  return parent.map((_, node) => find(node));
}

/** Tarjan's algorithm, iterative so that long chains of complexes cannot overflow the stack. */
function strongComponents(count: number, edges: Edge[]): number[] {
  const successors: number[][] = Array.from({ length: count }, () => []);
  for (const { from, to } of edges) successors[from].push(to);
  const index = new Array<number>(count).fill(-1);
  const low = new Array<number>(count).fill(0);
  const component = new Array<number>(count).fill(-1);
  const onStack = new Array<boolean>(count).fill(false);
  const stack: number[] = [];
  let counter = 0;
  let components = 0;
  for (let root = 0; root < count; root++) {
    if (index[root] !== -1) continue;
    const frames: { node: number; next: number }[] = [{ node: root, next: 0 }];
    index[root] = low[root] = counter++;
    stack.push(root);
    onStack[root] = true;
    while (frames.length > 0) {
      const frame = frames[frames.length - 1];
      const { node } = frame;
      if (frame.next < successors[node].length) {
        const successor = successors[node][frame.next++];
        if (index[successor] === -1) {
          index[successor] = low[successor] = counter++;
          stack.push(successor);
          onStack[successor] = true;
          frames.push({ node: successor, next: 0 });
        } else if (onStack[successor]) {
          low[node] = Math.min(low[node], index[successor]);
        }
        continue;
      }
      frames.pop();
      if (frames.length > 0) {
        const parent = frames[frames.length - 1].node;
        low[parent] = Math.min(low[parent], low[node]);
      }
      if (low[node] === index[node]) {
        let member: number;
        do {
          member = stack.pop()!;
          onStack[member] = false;
          component[member] = components;
        } while (member !== node);
        components++;
      }
    }
  }
  return component;
}
