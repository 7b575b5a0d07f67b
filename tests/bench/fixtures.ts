/** Networks for the benchmark scripts. */
import type { BuildDocument } from '../../src/engine/types';
import { alternator, amp, bank, cable, doc, node } from '../helpers/networks';

/** A synthetic network with exactly 200 cables: a trunk of blocks, each with amplifiers and grounds. */
export const synthetic200 = () => syntheticNetwork(200);

/** A synthetic network with exactly `count` cables, in the shape of `synthetic200`. */
export function syntheticNetwork(count: number): BuildDocument {
	const d = doc({ nodes: [node('gnd', 'chassis'), node('alt'), node('bat', 'battery')] });
	d.alternators.push(alternator('alt', 'alt', 'gnd', 600));
	d.banks.push(bank('front', 'bat', 'gnd', { stringsInParallel: 4 }));
	d.cables.push(cable('charge', 'alt', 'bat', { kind: 'awg', awg: '4/0' }, 1));
	let prev = 'bat';
	let i = 0;
	while (d.cables.length < count) {
		i++;
		const blk = `blk${i}`;
		d.nodes.push(node(blk, 'block'), node(`a${i}p`, 'amplifier'), node(`a${i}n`, 'amplifier'));
		d.cables.push(
			cable(`run${i}`, prev, blk, { kind: 'awg', awg: '4/0' }, 0.5, { parallelRuns: 2 }),
		);
		d.amplifiers.push(amp(`a${i}`, `a${i}p`, `a${i}n`, 40));
		d.cables.push(cable(`f${i}`, blk, `a${i}p`, { kind: 'awg', awg: '8' }, 1));
		if (d.cables.length < count)
			d.cables.push(cable(`g${i}`, `a${i}n`, 'gnd', { kind: 'awg', awg: '8' }, 1));
		else d.cables.pop();
		if (d.cables.length < count && i % 10 === 0) {
			d.nodes.push(node(`b${i}`, 'battery'));
			d.banks.push(bank(`bank${i}`, `b${i}`, 'gnd'));
			d.cables.push(cable(`bl${i}`, `b${i}`, blk, { kind: 'awg', awg: '1/0' }, 0.5));
		}
		prev = blk;
	}
	while (d.cables.length > count) d.cables.pop();
	// Any amplifier left without a ground gets one in place of its feed count.
	for (const a of d.amplifiers)
		if (!d.cables.some((c) => c.from === a.negative || c.to === a.negative))
			d.amplifiers.splice(d.amplifiers.indexOf(a), 1);
	d.nodes = d.nodes.filter(
		(n) =>
			n.kind === 'chassis' ||
			d.cables.some((c) => c.from === n.id || c.to === n.id) ||
			d.banks.some((b) => b.positive === n.id) ||
			d.alternators.some((a) => a.positive === n.id),
	);
	return d;
}

/** A 40-cable build: the size the editor must recompute on every keystroke (target < 16 ms). */
export function forty(): BuildDocument {
	const d = doc({
		nodes: [node('gnd', 'chassis'), node('alt'), node('bat', 'battery'), node('blk', 'block')],
	});
	d.alternators.push(alternator('alt', 'alt', 'gnd', 300));
	d.banks.push(bank('front', 'bat', 'gnd', { stringsInParallel: 2 }));
	d.cables.push(
		cable('charge', 'alt', 'bat', { kind: 'awg', awg: '1/0' }, 1),
		cable('run', 'bat', 'blk', { kind: 'awg', awg: '1/0' }, 5, { parallelRuns: 2 }),
	);
	for (let i = 1; d.cables.length < 40; i++) {
		d.nodes.push(node(`p${i}`, 'amplifier'), node(`n${i}`, 'amplifier'));
		d.amplifiers.push(amp(`a${i}`, `p${i}`, `n${i}`, 150));
		d.cables.push(
			cable(`f${i}`, 'blk', `p${i}`, { kind: 'awg', awg: '4' }, 1.5),
			cable(`g${i}`, `n${i}`, 'gnd', { kind: 'awg', awg: '4' }, 1),
		);
	}
	return d;
}

/**
 * A build at the schema's limits: exactly `count` cables (1,000 at most) on at most 100 amplifiers
 * and 500 nodes, the cables past the amplifiers' own being parallel runs along the trunk (a valid,
 * heavy network a member can save in one request).
 */
export function heavyValidNetwork(count = 1000): BuildDocument {
	const d = syntheticNetwork(280);
	const trunk = d.cables.filter((c) => c.id.startsWith('run'));
	let k = 0;
	while (d.cables.length < count) {
		const c = trunk[k % trunk.length]!;
		d.cables.push({ ...c, id: `par${++k}`, label: `${c.label} (parallel ${k})` });
	}
	return d;
}
