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
