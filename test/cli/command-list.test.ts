// The light command entries (what --help lists without loading every command) against the full
// definitions: the same help text, and the right command loaded for each command line.
import {describe, expect, it} from 'vitest';
import {commandList, commandNamed} from '../../src/cli/command-list.js';
import {buildProgram} from '../../src/cli/program.js';

describe('lazily loaded commands', () => {
	it('the top-level help is the same with light entries as with every command loaded', async () => {
		const light = await buildProgram([]);
		const full = await buildProgram([], true);
		expect(light.helpInformation()).toBe(full.helpInformation());
	});

	it('running a command loads it fully and lists the others the same way', async () => {
		const full = (await buildProgram([], true)).helpInformation();
		for (const entry of commandList) {
			const program = await buildProgram([entry.name]);
			expect(program.helpInformation()).toBe(full);
			const sub = program.commands.find((c) => c.name() === entry.name)!;
			const fullSub = (await buildProgram([], true)).commands.find((c) => c.name() === entry.name)!;
			expect(sub.helpInformation()).toBe(fullSub.helpInformation());
		}
	});

	it('finds the command a command line runs', () => {
		expect(commandNamed(['curve', 'plan.json', '--format', 'json'])?.name).toBe('curve');
		expect(commandNamed(['help', 'table'])?.name).toBe('table');
		expect(commandNamed(['--help'])).toBeUndefined();
		expect(commandNamed([])).toBeUndefined();
		expect(commandNamed(['curv'])).toBeUndefined();
	});
});
