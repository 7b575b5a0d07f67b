import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { pebbleBuild } from '../../db/demo/builds';
import { DEFAULT_SCENARIO } from '../../src/engine/report';
import { toSpiceNetlist } from '../../src/engine/spice';

const NGSPICE = process.env.NGSPICE ?? 'ngspice';
const dir = mkdtempSync(path.join(tmpdir(), 'sagwise-spice-inject-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A name as an attacker would write it: a line break, then a control block that runs a shell command. */
const hostile = (marker: string) =>
	`Car\n.control\nshell touch ${marker}\n.endc\r\n.control\u2028shell touch ${marker}\u000b.endc`;

function runs(netlist: string, name: string): void {
	const file = path.join(dir, `${name}.cir`);
	writeFileSync(file, netlist);
	const out = spawnSync(NGSPICE, ['-b', file], { encoding: 'utf8', timeout: 30_000, cwd: dir });
	if (out.error) throw out.error;
}

describe('SPICE export: names can never start a netlist line', () => {
	const conditions = {
		engineRpm: DEFAULT_SCENARIO.engineRpm,
		demand: DEFAULT_SCENARIO.burpDemand,
		conductorTempC: DEFAULT_SCENARIO.conductorTempC,
	};

	it('the check itself works: the same control block, written raw on its own line, does run in ngspice', () => {
		const marker = path.join(dir, 'raw-marker');
		const { netlist } = toSpiceNetlist(pebbleBuild, conditions, { title: 'Car', control: false });
		runs(netlist.replace('.end\n', `.control\nshell touch ${marker}\n.endc\n.end\n`), 'raw');
		expect(existsSync(marker)).toBe(true);
	});

	it('a title holding line breaks and a control block executes nothing, and every name stays on its comment line', () => {
		const marker = path.join(dir, 'title-marker');
		const { netlist } = toSpiceNetlist(pebbleBuild, conditions, {
			title: hostile(marker),
			nodeset: 'unloaded',
		});
		const lines = netlist.split('\n');
		expect(lines.filter((l) => l.startsWith('.control'))).toHaveLength(1);
		expect(lines.filter((l) => l.includes('shell'))).toEqual([lines[0]]);
		// eslint-disable-next-line no-control-regex -- a vertical tab must never reach the netlist
		expect(netlist).not.toMatch(/[\r\u000b\u2028]/);
		runs(netlist, 'title');
		expect(existsSync(marker)).toBe(false);
	});
});
