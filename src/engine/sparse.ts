import { solveDense } from './linear';
import { EngineInputError } from './errors';

/** Largest network the dense fallback takes (its cost grows as n³). */
const DENSE_FALLBACK_MAX = 400;

/** How a factorisation of a symmetric matrix ended. */
export type FactorResult = 'positive-definite' | 'indefinite' | 'singular';

/**
 * A symmetric linear system whose pattern is fixed when it is made: the nodal Jacobian of one
 * compiled network. Assembly adds into `values` through `slot(i, j)`; `factor()` then `solve(b)`.
 */
export interface SymmetricSystem {
	readonly n: number;
	/** The matrix entries, written by assembly (zero them with `clear()` first). */
	readonly values: Float64Array;
	/** Index in `values` of entry (i, j) = (j, i), in the caller's numbering; -1 if either is < 0. */
	slot(i: number, j: number): number;
	clear(): void;
	/** Factorises the assembled matrix; its pivots say whether it is positive definite. */
	factor(): FactorResult;
	/** Overwrites b with A⁻¹b, using the last successful factorisation. */
	solve(b: Float64Array): void;
}

/**
 * The fill-reducing order and the filled pattern, from the elimination game with minimum degree
 * (Tinney–Walker scheme 2; George & Liu, "Computer Solution of Large Sparse Positive Definite
 * Systems", 1981, ch. 5). Ties go to the lower index so the order is deterministic. The networks
 * are nearly trees: leaves go first and the fill stays close to none.
 */
function minimumDegreeOrder(n: number, edges: ReadonlyArray<readonly [number, number]>) {
	const adj: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
	for (const [a, b] of edges) {
		if (a < 0 || b < 0 || a === b) continue;
		adj[a]!.add(b);
		adj[b]!.add(a);
	}
	// A binary heap of (degree, node) with stale entries skipped when popped.
	const heapDeg: number[] = [];
	const heapNode: number[] = [];
	const less = (i: number, j: number) =>
		heapDeg[i]! < heapDeg[j]! || (heapDeg[i] === heapDeg[j] && heapNode[i]! < heapNode[j]!);
	const swap = (i: number, j: number) => {
		[heapDeg[i], heapDeg[j]] = [heapDeg[j]!, heapDeg[i]!];
		[heapNode[i], heapNode[j]] = [heapNode[j]!, heapNode[i]!];
	};
	const push = (deg: number, node: number) => {
		heapDeg.push(deg);
		heapNode.push(node);
		let i = heapDeg.length - 1;
		while (i > 0) {
			const parent = (i - 1) >> 1;
			if (!less(i, parent)) break;
			swap(i, parent);
			i = parent;
		}
	};
	const pop = (): [number, number] => {
		const top: [number, number] = [heapDeg[0]!, heapNode[0]!];
		const lastDeg = heapDeg.pop()!;
		const lastNode = heapNode.pop()!;
		if (heapDeg.length > 0) {
			heapDeg[0] = lastDeg;
			heapNode[0] = lastNode;
			let i = 0;
			for (;;) {
				const l = 2 * i + 1;
				const r = l + 1;
				let m = i;
				if (l < heapDeg.length && less(l, m)) m = l;
				if (r < heapDeg.length && less(r, m)) m = r;
				if (m === i) break;
				swap(i, m);
				i = m;
			}
		}
		return top;
	};
	for (let i = 0; i < n; i++) push(adj[i]!.size, i);
	const done = new Uint8Array(n);
	const order: number[] = [];
	const columns: number[][] = new Array(n);
	while (order.length < n) {
		const [deg, v] = pop();
		if (done[v] || deg !== adj[v]!.size) continue;
		done[v] = 1;
		order.push(v);
		const nbrs = [...adj[v]!];
		columns[v] = nbrs;
		for (const a of nbrs) {
			const set = adj[a]!;
			set.delete(v);
			for (const b of nbrs) if (b !== a) set.add(b);
			push(set.size, a);
		}
		adj[v]!.clear();
	}
	return { order, columns };
}

/**
 * Sparse LDLᵀ factorisation (no pivoting) on a symbolic pattern made once: every numeric
 * factorisation only walks precomputed index lists, so repeated solves of one network (Newton
 * iterations, time steps) allocate nothing. A nodal matrix of cables and sources is symmetric, and
 * positive definite exactly at a stable operating point; the pivots D answer that question as the
 * step is solved (Sylvester's criterion via the LDLᵀ inertia). When a pivot is too small to trust
 * without pivoting (an indefinite matrix far from any operating point), the factorisation falls
 * back to dense LU with partial pivoting for that matrix, as before.
 */
export class SparseLdl implements SymmetricSystem {
	readonly n: number;
	readonly values: Float64Array;
	/** perm[k] = caller's index of the k-th eliminated unknown; inv is its inverse. */
	private readonly perm: Int32Array;
	private readonly inv: Int32Array;
	/** Strictly lower entries of L by column (eliminated order): rows and their value offsets. */
	private readonly colPtr: Int32Array;
	private readonly rowIdx: Int32Array;
	/** For column k, the targets of the rank-one update, pair by pair (a ≥ b). */
	private readonly updPtr: Int32Array;
	private readonly updTarget: Int32Array;
	private readonly slots = new Map<number, number>();
	private readonly work: Float64Array;
	private readonly diagScale: Float64Array;
	/** The assembled entries as they were before the factorisation overwrote them. */
	private readonly original: Float64Array;
	/** The dense matrix of the last fallback, factorised again by each solve. */
	private dense: Float64Array | null = null;

	constructor(n: number, edges: ReadonlyArray<readonly [number, number]>) {
		this.n = n;
		const { order, columns } = minimumDegreeOrder(n, edges);
		this.perm = Int32Array.from(order);
		this.inv = new Int32Array(n);
		order.forEach((old, k) => (this.inv[old] = k));
		const colPtr = new Int32Array(n + 1);
		const rows: number[] = [];
		for (let k = 0; k < n; k++) {
			const col = columns[order[k]!]!.map((old) => this.inv[old]!).sort((a, b) => a - b);
			for (const r of col) rows.push(r);
			colPtr[k + 1] = rows.length;
		}
		this.colPtr = colPtr;
		this.rowIdx = Int32Array.from(rows);
		for (let c = 0; c < n; c++)
			for (let p = colPtr[c]!; p < colPtr[c + 1]!; p++)
				this.slots.set(this.rowIdx[p]! * n + c, n + p);
		const updPtr = new Int32Array(n + 1);
		const targets: number[] = [];
		for (let k = 0; k < n; k++) {
			const start = colPtr[k]!;
			const m = colPtr[k + 1]! - start;
			for (let a = 0; a < m; a++)
				for (let b = 0; b <= a; b++) {
					const ra = this.rowIdx[start + a]!;
					const rb = this.rowIdx[start + b]!;
					targets.push(a === b ? ra : this.slots.get(ra * n + rb)!);
				}
			updPtr[k + 1] = targets.length;
		}
		this.updPtr = updPtr;
		this.updTarget = Int32Array.from(targets);
		this.values = new Float64Array(n + rows.length);
		this.original = new Float64Array(n + rows.length);
		this.work = new Float64Array(n);
		this.diagScale = new Float64Array(n);
	}

	/** Entries of L off the diagonal: the fill the ordering left, for benchmarks and tests. */
	get lowerEntries(): number {
		return this.rowIdx.length;
	}

	slot(i: number, j: number): number {
		if (i < 0 || j < 0) return -1;
		const a = this.inv[i]!;
		const b = this.inv[j]!;
		if (a === b) return a;
		const s = this.slots.get(a > b ? a * this.n + b : b * this.n + a);
		if (s === undefined)
			throw new EngineInputError([
				{ path: '', message: `Entry (${i}, ${j}) is outside the network's pattern` },
			]);
		return s;
	}

	clear(): void {
		this.values.fill(0);
	}

	factor(): FactorResult {
		const { n, values: x, colPtr, updPtr, updTarget, diagScale } = this;
		this.dense = null;
		this.original.set(x);
		for (let k = 0; k < n; k++) diagScale[k] = Math.abs(x[k]!);
		let positive = true;
		for (let k = 0; k < n; k++) {
			const d = x[k]!;
			if (!(Math.abs(d) > 1e-12 * diagScale[k]!) || !Number.isFinite(d)) return this.fallback();
			if (d <= 0) positive = false;
			const start = n + colPtr[k]!;
			const m = colPtr[k + 1]! - colPtr[k]!;
			let t = updPtr[k]!;
			for (let a = 0; a < m; a++) {
				const la = x[start + a]!;
				if (la === 0) {
					t += a + 1;
					continue;
				}
				const f = la / d;
				for (let b = 0; b <= a; b++) x[updTarget[t++]!]! -= f * x[start + b]!;
			}
			for (let a = 0; a < m; a++) x[start + a]! /= d;
		}
		return positive ? 'positive-definite' : 'indefinite';
	}

	/**
	 * A pivot too small for elimination without pivoting: a positive definite matrix never has one
	 * (its pivots are bounded below by its smallest eigenvalue), so the matrix is singular or
	 * indefinite. Dense LU with partial pivoting decides which, for networks small enough for it.
	 */
	private fallback(): FactorResult {
		const { n } = this;
		if (n > DENSE_FALLBACK_MAX) return 'singular';
		const a = new Float64Array(n * n);
		for (let i = 0; i < n; i++) a[i * n + i] = this.original[this.inv[i]!]!;
		for (const [key, s] of this.slots) {
			const r = this.perm[Math.floor(key / n)]!;
			const c = this.perm[key % n]!;
			a[r * n + c] = this.original[s]!;
			a[c * n + r] = this.original[s]!;
		}
		if (!solveDense(new Float64Array(a), new Float64Array(n), n)) return 'singular';
		this.dense = a;
		return 'indefinite';
	}

	solve(b: Float64Array): void {
		const { n, values: x, perm, colPtr, rowIdx, work: z } = this;
		if (this.dense) {
			solveDense(new Float64Array(this.dense), b, n);
			return;
		}
		for (let k = 0; k < n; k++) z[k] = b[perm[k]!]!;
		for (let k = 0; k < n; k++) {
			const zk = z[k]!;
			if (zk === 0) continue;
			for (let p = colPtr[k]!; p < colPtr[k + 1]!; p++) z[rowIdx[p]!]! -= x[n + p]! * zk;
		}
		for (let k = 0; k < n; k++) z[k]! /= x[k]!;
		for (let k = n - 1; k >= 0; k--) {
			let s = z[k]!;
			for (let p = colPtr[k]!; p < colPtr[k + 1]!; p++) s -= x[n + p]! * z[rowIdx[p]!]!;
			z[k] = s;
		}
		for (let k = 0; k < n; k++) b[perm[k]!] = z[k]!;
	}
}
