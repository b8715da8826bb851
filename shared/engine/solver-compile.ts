/**
 * Compile step of the Lotwise nodal solver: semantic checks of a netlist, node numbering, a
 * minimum-degree elimination order with the port nodes last, and the symbolic factorization (fill-in)
 * written as flat integer op lists for the numeric loop in solver-evaluate.ts.
 */
import { EngineError } from "./errors";
import { GROUND_NODE, type Netlist, type Part } from "./netlist";
import { hasIdealInductance, hasSeriesBranch } from "./models";

/**
 * Symbolic plan of the sparse elimination. Slots are the nonzeros of the (filled) symmetric nodal
 * matrix: slot n (< nodeCount) is the diagonal of node n, higher slots are off-diagonal pairs.
 * Internal (non-port) nodes are eliminated in `pivotNode` order; what is left in the port-node
 * block is the Schur complement, the admittance matrix seen at the ports.
 */
export interface SolverPlan {
  readonly nodeCount: number;
  readonly slotCount: number;
  /** Node index of each part end (−1 = ground). */
  readonly partNodeA: Int32Array;
  readonly partNodeB: Int32Array;
  /** Slots each part stamps: diagonal of end A, of end B, the off-diagonal (−1 when an end is ground). */
  readonly partDiagA: Int32Array;
  readonly partDiagB: Int32Array;
  readonly partOff: Int32Array;
  /** Parts with a series R-L-C branch in their model (see models.ts). */
  readonly branchParts: Int32Array;
  /** Node index of each port, and its index in the port block (ports may share a node). */
  readonly portNode: Int32Array;
  readonly portBlock: Int32Array;
  /** Distinct port nodes, in port order; `blockSlot[a*M + b]` is the slot of (blockNodes[a], blockNodes[b]). */
  readonly blockNodes: Int32Array;
  readonly blockSlot: Int32Array;
  /** Elimination steps: pivot node, and its still-active neighbours as slots nbSlot[nbStart[t] .. nbStart[t+1]). */
  readonly pivotNode: Int32Array;
  readonly nbStart: Int32Array;
  readonly nbSlot: Int32Array;
  /** Schur updates of step t, updStart[t] .. updStart[t+1]: slot updTarget −= L[updA]·U[updB] (positions in nb arrays). */
  readonly updStart: Int32Array;
  readonly updTarget: Int32Array;
  readonly updA: Int32Array;
  readonly updB: Int32Array;
  /**
   * 1 when step t eliminates a purely reactive pivot: its diagonal and neighbour slots can only hold
   * imaginary values (no R, no lossy branch, no port termination has reached them), so L is real and
   * the step runs in real arithmetic on imaginary parts (a lossless LC section).
   */
  readonly pivotImag: Uint8Array;
  /** 1 for slots that can hold a real part at some point; the others are purely imaginary throughout. */
  readonly slotReal: Uint8Array;
  /** Ref of the first ideal inductor (a short at DC), or null. */
  readonly idealInductorRef: string | null;
}

/** Validate a netlist and build its {@link SolverPlan}. Throws EngineError INVALID_NETLIST naming the part or port. */
export function planNetlist(netlist: Netlist): { nodeNames: string[]; plan: SolverPlan } {
  validateShape(netlist);
  const parts = netlist.parts;
  const ports = netlist.ports;
  const nodeIndex = new Map<string, number>();
  const nodeNames: string[] = [];
  const idOf = (name: string): number => {
    if (name === GROUND_NODE) return -1;
    let id = nodeIndex.get(name);
    if (id === undefined) {
      id = nodeNames.length;
      nodeIndex.set(name, id);
      nodeNames.push(name);
    }
    return id;
  };
  const partNodeA = new Int32Array(parts.length);
  const partNodeB = new Int32Array(parts.length);
  parts.forEach((p, k) => {
    partNodeA[k] = idOf(p.nodes[0]);
    partNodeB[k] = idOf(p.nodes[1]);
  });
  const portNode = new Int32Array(ports.length);
  ports.forEach((port, k) => {
    const id = nodeIndex.get(port.node);
    if (id === undefined) {
      throw netlistError(`port "${port.name}": node "${port.node}" is not connected to any part`, `ports[${k}].node`);
    }
    portNode[k] = id;
  });
  checkTopology(netlist, nodeNames, partNodeA, partNodeB, portNode);
  return { nodeNames, plan: buildPlan(netlist, nodeNames.length, partNodeA, partNodeB, portNode) };
}

function netlistError(message: string, path: string): EngineError {
  return new EngineError("INVALID_NETLIST", message, { path });
}

const isPositive = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v) && v > 0;
const isNonNegative = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v) && v >= 0;

function validateShape(netlist: Netlist): void {
  if (netlist === null || typeof netlist !== "object") throw netlistError("netlist must be an object with `ports` and `parts`", "");
  if (!Array.isArray(netlist.parts) || netlist.parts.length === 0) throw netlistError("netlist needs at least one part", "parts");
  if (!Array.isArray(netlist.ports)) throw netlistError("netlist needs a `ports` list", "ports");
  const refs = new Map<string, number>();
  netlist.parts.forEach((part, k) => validatePart(part, k, refs));
  if (netlist.ports.length < 2) throw netlistError(`netlist needs at least 2 ports (has ${netlist.ports.length})`, "ports");
  const names = new Map<string, number>();
  netlist.ports.forEach((port, k) => {
    const at = `ports[${k}]`;
    if (port === null || typeof port !== "object" || typeof port.name !== "string" || port.name === "") {
      throw netlistError(`port ${k + 1}: name must be a non-empty string`, `${at}.name`);
    }
    const first = names.get(port.name);
    if (first !== undefined) throw netlistError(`port "${port.name}": duplicate port name (also ports[${first}])`, `${at}.name`);
    names.set(port.name, k);
    if (typeof port.node !== "string" || port.node === "") throw netlistError(`port "${port.name}": node must be a non-empty string`, `${at}.node`);
    if (port.node === GROUND_NODE) throw netlistError(`port "${port.name}": node cannot be ground ("${GROUND_NODE}")`, `${at}.node`);
    if (!isPositive(port.z0)) throw netlistError(`port "${port.name}": z0 must be a finite number > 0 (got ${String(port.z0)})`, `${at}.z0`);
  });
}

function validatePart(part: Part, k: number, refs: Map<string, number>): void {
  const at = `parts[${k}]`;
  if (part === null || typeof part !== "object" || typeof part.ref !== "string" || part.ref === "") {
    throw netlistError(`part ${k + 1}: ref must be a non-empty string`, `${at}.ref`);
  }
  const ref = part.ref;
  const first = refs.get(ref);
  if (first !== undefined) throw netlistError(`part ${ref}: duplicate ref (also parts[${first}])`, `${at}.ref`);
  refs.set(ref, k);
  if (part.kind !== "R" && part.kind !== "L" && part.kind !== "C") {
    throw netlistError(`part ${ref}: kind must be R, L or C (got ${String(part.kind)})`, `${at}.kind`);
  }
  const nodes = part.nodes;
  if (!Array.isArray(nodes) || nodes.length !== 2 || typeof nodes[0] !== "string" || typeof nodes[1] !== "string" || nodes[0] === "" || nodes[1] === "") {
    throw netlistError(`part ${ref}: nodes must be two non-empty node names`, `${at}.nodes`);
  }
  if (nodes[0] === nodes[1]) throw netlistError(`part ${ref}: both ends are on node "${nodes[0]}"`, `${at}.nodes`);
  if (!isPositive(part.value)) throw netlistError(`part ${ref}: value must be a finite number > 0 (got ${String(part.value)})`, `${at}.value`);
  if (part.q !== undefined) {
    if (part.kind !== "L") throw netlistError(`part ${ref}: q applies only to inductors`, `${at}.q`);
    if (part.q === null || !isPositive(part.q.value)) throw netlistError(`part ${ref}: q.value must be a finite number > 0`, `${at}.q.value`);
    if (!isPositive(part.q.at)) throw netlistError(`part ${ref}: q.at must be a finite frequency > 0 Hz`, `${at}.q.at`);
  }
  if (part.srf !== undefined) {
    if (part.kind !== "L") throw netlistError(`part ${ref}: srf applies only to inductors`, `${at}.srf`);
    if (!isPositive(part.srf)) throw netlistError(`part ${ref}: srf must be a finite frequency > 0 Hz`, `${at}.srf`);
  }
  for (const field of ["esr", "esl"] as const) {
    if (part[field] === undefined) continue;
    if (part.kind !== "C") throw netlistError(`part ${ref}: ${field} applies only to capacitors`, `${at}.${field}`);
    if (!isNonNegative(part[field])) throw netlistError(`part ${ref}: ${field} must be a finite number ≥ 0`, `${at}.${field}`);
  }
  if (part.tempco !== undefined && !(typeof part.tempco === "number" && Number.isFinite(part.tempco))) {
    throw netlistError(`part ${ref}: tempco must be a finite number (ppm/°C)`, `${at}.tempco`);
  }
}

/** Dangling nodes (one part end, no port) and floating islands (no path to ground through parts or ports). */
function checkTopology(netlist: Netlist, nodeNames: string[], a: Int32Array, b: Int32Array, portNode: Int32Array): void {
  const n = nodeNames.length;
  const ends = new Int32Array(n);
  const lastPart = new Int32Array(n).fill(-1);
  const hasPort = new Uint8Array(n);
  for (const p of portNode) hasPort[p] = 1;
  for (let k = 0; k < a.length; k++) {
    for (const v of [a[k], b[k]]) {
      if (v < 0) continue;
      ends[v]++;
      lastPart[v] = k;
    }
  }
  for (let v = 0; v < n; v++) {
    if (ends[v] === 1 && !hasPort[v]) {
      const k = lastPart[v];
      throw netlistError(`part ${netlist.parts[k].ref}: node "${nodeNames[v]}" is dangling (no other part or port connects to it)`, `parts[${k}].nodes`);
    }
  }
  // Union-find with ground as element n; a port's termination ties its node to ground.
  const parent = Int32Array.from({ length: n + 1 }, (_, i) => i);
  const find = (x: number): number => {
    while (parent[x] !== x) x = parent[x] = parent[parent[x]];
    return x;
  };
  const unite = (x: number, y: number) => {
    parent[find(x)] = find(y);
  };
  for (let k = 0; k < a.length; k++) unite(a[k] < 0 ? n : a[k], b[k] < 0 ? n : b[k]);
  for (const p of portNode) unite(p, n);
  const ground = find(n);
  for (let k = 0; k < a.length; k++) {
    const v = a[k] >= 0 ? a[k] : b[k];
    if (find(v) !== ground) {
      throw netlistError(
        `part ${netlist.parts[k].ref}: node "${nodeNames[v]}" is floating (no path to ground or to a port through parts)`,
        `parts[${k}].nodes`,
      );
    }
  }
}

function buildPlan(netlist: Netlist, n: number, partNodeA: Int32Array, partNodeB: Int32Array, portNode: Int32Array): SolverPlan {
  const parts = netlist.parts;
  const slotOf = new Map<number, number>();
  let slotCount = n;
  const pairSlot = (i: number, j: number): number => {
    if (i === j) return i;
    const key = i < j ? i * n + j : j * n + i;
    let s = slotOf.get(key);
    if (s === undefined) {
      s = slotCount++;
      slotOf.set(key, s);
    }
    return s;
  };
  const adj = Array.from({ length: n }, () => new Set<number>());
  const partDiagA = new Int32Array(parts.length).fill(-1);
  const partDiagB = new Int32Array(parts.length).fill(-1);
  const partOff = new Int32Array(parts.length).fill(-1);
  for (let k = 0; k < parts.length; k++) {
    const i = partNodeA[k], j = partNodeB[k];
    if (i >= 0) partDiagA[k] = i;
    if (j >= 0) partDiagB[k] = j;
    if (i >= 0 && j >= 0) {
      partOff[k] = pairSlot(i, j);
      adj[i].add(j);
      adj[j].add(i);
    }
  }
  // Port block: distinct port nodes, kept dense and eliminated last (their Schur complement is the
  // port admittance matrix).
  const blockList: number[] = [];
  const portBlock = new Int32Array(portNode.length);
  portNode.forEach((v, p) => {
    let b = blockList.indexOf(v);
    if (b < 0) b = blockList.push(v) - 1;
    portBlock[p] = b;
  });
  const isPort = new Uint8Array(n);
  for (const v of blockList) isPort[v] = 1;

  // Minimum-degree order on the internal nodes (ties: lowest index, so the order is deterministic).
  const active = new Uint8Array(n).fill(1);
  const pivots: number[] = [];
  const nbSlot: number[] = [];
  const nbStart: number[] = [0];
  const updTarget: number[] = [];
  const updA: number[] = [];
  const updB: number[] = [];
  const updStart: number[] = [0];
  const internalCount = n - blockList.length;
  for (let step = 0; step < internalCount; step++) {
    let best = -1;
    for (let v = 0; v < n; v++) {
      if (active[v] && !isPort[v] && (best < 0 || adj[v].size < adj[best].size)) best = v;
    }
    const nbs = [...adj[best]].sort((x, y) => x - y);
    const base = nbSlot.length;
    for (const u of nbs) nbSlot.push(pairSlot(best, u));
    for (let x = 0; x < nbs.length; x++) {
      for (let y = x; y < nbs.length; y++) {
        updTarget.push(pairSlot(nbs[x], nbs[y]));
        updA.push(base + x);
        updB.push(base + y);
        if (x !== y) {
          adj[nbs[x]].add(nbs[y]);
          adj[nbs[y]].add(nbs[x]);
        }
      }
    }
    for (const u of nbs) adj[u].delete(best);
    active[best] = 0;
    pivots.push(best);
    nbStart.push(nbSlot.length);
    updStart.push(updTarget.length);
  }
  // Which slots can carry a real part: those an R, a lossy branch or a port termination stamps,
  // and every target of a step whose pivot is not purely reactive.
  const realSlot = new Uint8Array(slotCount);
  for (let k = 0; k < parts.length; k++) {
    if (parts[k].kind !== "R" && !hasSeriesBranch(parts[k])) continue;
    for (const sl of [partDiagA[k], partDiagB[k], partOff[k]]) if (sl >= 0) realSlot[sl] = 1;
  }
  for (const v of portNode) realSlot[v] = 1;
  const pivotImag = new Uint8Array(pivots.length);
  for (let t = 0; t < pivots.length; t++) {
    let imag = !realSlot[pivots[t]];
    for (let q = nbStart[t]; q < nbStart[t + 1]; q++) if (realSlot[nbSlot[q]]) imag = false;
    pivotImag[t] = imag ? 1 : 0;
    if (!imag) for (let e = updStart[t]; e < updStart[t + 1]; e++) realSlot[updTarget[e]] = 1;
  }
  const m = blockList.length;
  const blockSlot = new Int32Array(m * m);
  for (let x = 0; x < m; x++) for (let y = 0; y < m; y++) blockSlot[x * m + y] = pairSlot(blockList[x], blockList[y]);

  const branchParts = Int32Array.from(parts.flatMap((p, k) => (hasSeriesBranch(p) ? [k] : [])));
  const ideal = parts.find(hasIdealInductance);
  return {
    nodeCount: n,
    slotCount,
    partNodeA,
    partNodeB,
    partDiagA,
    partDiagB,
    partOff,
    branchParts,
    portNode,
    portBlock,
    blockNodes: Int32Array.from(blockList),
    blockSlot,
    pivotNode: Int32Array.from(pivots),
    nbStart: Int32Array.from(nbStart),
    nbSlot: Int32Array.from(nbSlot),
    updStart: Int32Array.from(updStart),
    updTarget: Int32Array.from(updTarget),
    updA: Int32Array.from(updA),
    updB: Int32Array.from(updB),
    pivotImag,
    slotReal: realSlot,
    idealInductorRef: ideal ? ideal.ref : null,
  };
}
