import type { FactorResult, SymmetricSystem } from './sparse';

/**
 * Dense LU solve with partial pivoting, in place. `a` is row-major n×n; `b` is overwritten with x.
 * Returns false when the matrix is singular to working precision.
 */
export function solveDense(a: Float64Array, b: Float64Array, n: number): boolean {
	for (let k = 0; k < n; k++) {
		let pivot = k;
		let max = Math.abs(a[k * n + k]!);
		for (let i = k + 1; i < n; i++) {
			const v = Math.abs(a[i * n + k]!);
			if (v > max) {
				max = v;
				pivot = i;
			}
		}
		if (max === 0 || !Number.isFinite(max)) return false;
		if (pivot !== k) {
			for (let j = 0; j < n; j++) {
				const t = a[k * n + j]!;
				a[k * n + j] = a[pivot * n + j]!;
				a[pivot * n + j] = t;
			}
			const t = b[k]!;
			b[k] = b[pivot]!;
			b[pivot] = t;
		}
		const akk = a[k * n + k]!;
		for (let i = k + 1; i < n; i++) {
			const f = a[i * n + k]! / akk;
			if (f === 0) continue;
			a[i * n + k] = 0;
			for (let j = k + 1; j < n; j++) a[i * n + j] -= f * a[k * n + j]!;
			b[i] -= f * b[k]!;
		}
	}
	for (let i = n - 1; i >= 0; i--) {
		let s = b[i]!;
		for (let j = i + 1; j < n; j++) s -= a[i * n + j]! * b[j]!;
		b[i] = s / a[i * n + i]!;
	}
	return true;
}

/**
 * The same system held dense: LU with partial pivoting for the step and a Cholesky test for
 * stability. Slower than `SparseLdl` past a few dozen nodes; kept as the reference the sparse
 * factorisation is checked against.
 */
export class DenseSystem implements SymmetricSystem {
	readonly n: number;
	readonly values: Float64Array;
	private readonly full: Float64Array;

	constructor(n: number) {
		this.n = n;
		this.values = new Float64Array(n * n);
		this.full = new Float64Array(n * n);
	}

	slot(i: number, j: number): number {
		if (i < 0 || j < 0) return -1;
		return i >= j ? i * this.n + j : j * this.n + i;
	}

	clear(): void {
		this.values.fill(0);
	}

	factor(): FactorResult {
		const { n, values, full } = this;
		for (let i = 0; i < n; i++)
			for (let j = 0; j <= i; j++) {
				full[i * n + j] = values[i * n + j]!;
				full[j * n + i] = values[i * n + j]!;
			}
		if (isPositiveDefinite(full, n)) return 'positive-definite';
		return solveDense(new Float64Array(full), new Float64Array(n), n) ? 'indefinite' : 'singular';
	}

	solve(b: Float64Array): void {
		solveDense(new Float64Array(this.full), b, this.n);
	}
}

/** Cholesky test of a symmetric matrix: positive definite ⇔ every pivot is positive. */
function isPositiveDefinite(a: Float64Array, n: number): boolean {
	const l = new Float64Array(a);
	for (let k = 0; k < n; k++) {
		let d = l[k * n + k]!;
		for (let m = 0; m < k; m++) d -= l[k * n + m]! ** 2;
		if (!(d > 0)) return false;
		const s = Math.sqrt(d);
		l[k * n + k] = s;
		for (let i = k + 1; i < n; i++) {
			let x = l[i * n + k]!;
			for (let m = 0; m < k; m++) x -= l[i * n + m]! * l[k * n + m]!;
			l[i * n + k] = x / s;
		}
	}
	return true;
}
