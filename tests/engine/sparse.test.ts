import { describe, expect, it } from 'vitest';
import { DEMO_BUILDS } from '../../db/demo/builds';
import { DenseSystem } from '../../src/engine/linear';
import { compileNetwork } from '../../src/engine/network';
import { solveCompiled } from '../../src/engine/solver';
import { SparseLdl, type SymmetricSystem } from '../../src/engine/sparse';
import { syntheticNetwork } from '../bench/fixtures';
import { randomNetwork, rng } from '../helpers/networks';

const AT = { engineRpm: 1500, demand: 1, conductorTempC: 25 };

/** A random sparse symmetric pattern: a spanning tree plus a few cross-links. */
function randomPattern(seed: number, n: number) {
	const r = rng(seed);
	const edges: Array<[number, number]> = [];
	for (let i = 1; i < n; i++) edges.push([i, r.int(0, i - 1)]);
	for (let k = 0; k < Math.floor(n / 4); k++) {
		const a = r.int(0, n - 1);
		const b = r.int(0, n - 1);
		if (a !== b) edges.push([a, b]);
	}
	return { r, edges };
}

/** Assembles the same matrix into a system: off-diagonals -g, diagonals the row sum plus `shift`. */
function assemble(
	s: SymmetricSystem,
	edges: ReadonlyArray<readonly [number, number]>,
	g: number[],
	shift: number[],
) {
	s.clear();
	edges.forEach(([a, b], k) => {
		s.values[s.slot(a, b)] -= g[k]!;
		s.values[s.slot(a, a)] += g[k]!;
		s.values[s.slot(b, b)] += g[k]!;
	});
	shift.forEach((d, i) => (s.values[s.slot(i, i)] += d));
}

describe('SparseLdl', () => {
	// Reference: dense LU with partial pivoting and a Cholesky test (linear.ts), the textbook
	// algorithms (Golub & Van Loan, "Matrix Computations", 4th ed., §3.4 and §4.2).
	it('solves as dense LU does and gives the same positive-definite verdict', () => {
		for (let seed = 1; seed <= 40; seed++) {
			const n = 5 + (seed % 30);
			const { r, edges } = randomPattern(seed, n);
			const g = edges.map(() => r.between(0.1, 100));
			// A Laplacian plus a positive shift is positive definite (diagonally dominant); a few
			// negative shifts (constant-power loads) make some of them indefinite.
			const shift = Array.from({ length: n }, () =>
				seed % 3 === 0 ? r.between(-50, 1) : r.between(0.01, 1),
			);
			const sparse = new SparseLdl(n, edges);
			const dense = new DenseSystem(n);
			assemble(sparse, edges, g, shift);
			assemble(dense, edges, g, shift);
			const verdict = dense.factor();
			expect(sparse.factor()).toBe(verdict);
			if (verdict === 'singular') continue;
			const b = Float64Array.from({ length: n }, () => r.between(-10, 10));
			const xs = new Float64Array(b);
			const xd = new Float64Array(b);
			sparse.solve(xs);
			dense.solve(xd);
			for (let i = 0; i < n; i++) expect(xs[i]).toBeCloseTo(xd[i]!, 8);
		}
	});

	it('calls a Laplacian with no path to ground singular', () => {
		// A pure Laplacian has the constant vector in its null space (any circuit text on nodal analysis).
		const edges: Array<[number, number]> = [
			[0, 1],
			[1, 2],
			[2, 0],
		];
		const s = new SparseLdl(3, edges);
		assemble(s, edges, [1, 2, 3], [0, 0, 0]);
		expect(s.factor()).toBe('singular');
	});

	it('keeps the fill of a tree-like network near zero, so cost grows about linearly', () => {
		// Minimum degree eliminates a tree with no fill (George & Liu 1981, ch. 5): the fill of the
		// synthetic trunk networks stays within a small multiple of the cable count.
		for (const count of [500, 2000]) {
			const net = compileNetwork(syntheticNetwork(count), AT);
			const lower = (net.system as SparseLdl).lowerEntries;
			expect(lower).toBeLessThan(2 * count);
		}
	});
});

describe('the sparse network solver', () => {
	const cases: Array<[string, Parameters<typeof compileNetwork>[0]]> = [
		...Object.entries(DEMO_BUILDS),
		...Array.from({ length: 25 }, (_, i) => [`random ${i + 1}`, randomNetwork(i + 1)] as const),
		['synthetic 200', syntheticNetwork(200)],
	] as Array<[string, Parameters<typeof compileNetwork>[0]]>;

	it.each(cases)('gives the node voltages the dense reference gives: %s', (_, d) => {
		for (const conditions of [AT, { ...AT, engineRpm: 0 }, { ...AT, demand: 4 }]) {
			const a = solveCompiled(compileNetwork(d, conditions));
			const b = solveCompiled(compileNetwork(d, conditions, { linear: 'dense' }));
			expect(a.collapsed).toBe(b.collapsed);
			expect(a.lambda).toBeCloseTo(b.lambda, 4);
			for (let i = 0; i < a.v.length; i++) expect(a.v[i]).toBeCloseTo(b.v[i]!, 6);
		}
	});
});
