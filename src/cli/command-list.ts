/**
 * The sub-commands as the top-level help lists them, and where each one's full definition lives.
 * Only the command being run is loaded (with its engine, schemas and formats); the others appear
 * as light entries, so `--version` and `--help` start about as fast as Node itself. A test holds
 * these entries to the full definitions, so the two cannot drift apart.
 */
import type {Command} from 'commander';
import {commandWord} from './command-word.js';

export interface CommandEntry {
	readonly name: string;
	/** As the top-level help shows it: name, `[options]` and arguments. */
	readonly term: string;
	readonly description: string;
	readonly register: () => Promise<(program: Command) => void>;
}

export const commandList: readonly CommandEntry[] = [
	{
		name: 'curve',
		term: 'curve [options] <plan>',
		description: 'compute the depth-gain curve and slider starting points of a plan file ("-" reads standard input)',
		register: async () => (await import('./curve-command.js')).registerCurveCommand,
	},
	{
		name: 'ladder',
		term: 'ladder [options] <plan>',
		description: 'penetration at each probe frequency and the highest frequency that reaches the target depth',
		register: async () => (await import('./ladder-command.js')).registerLadderCommand,
	},
	{
		name: 'presets',
		term: 'presets',
		description:
			'built-in region templates and your own presets (list, show, save, rename, copy, delete, export, import)',
		register: async () => (await import('./presets-command.js')).registerPresetsCommand,
	},
	{
		name: 'refine',
		term: 'refine [options] <image>',
		description:
			"measure a patient image taken with known settings against a plan: band levels, slider corrections, the layer's own attenuation",
		register: async () => (await import('./refine-command.js')).registerRefineCommand,
	},
	{
		name: 'table',
		term: 'table [options] [plan]',
		description:
			'default compensation tables for protocols: a plan or preset swept over habitus, probe ' +
			'frequency, beam angle, receive mode and tissue swaps',
		register: async () => (await import('./table-command.js')).registerTableCommand,
	},
	{
		name: 'preview',
		term: 'preview [options] <plan>',
		description:
			"a simulated B-mode illustration of a plan: the built-in ramp alone and the plan's sliders, in the terminal or as PNG",
		register: async () => (await import('./preview-command.js')).registerPreviewCommand,
	},
	{
		name: 'simulate',
		term: 'simulate [options] <plan>',
		description:
			'write invented demo images with their truth: a phantom series (with a scanner session file) or a patient image',
		register: async () => (await import('./simulate-command.js')).registerSimulateCommand,
	},
	{
		name: 'scanner',
		term: 'scanner',
		description:
			'measure your scanner from phantom images and keep it as a profile plans can name ' +
			'(calibrate, list, show, delete, rename, export, import)',
		register: async () => (await import('./scanner-command.js')).registerScannerCommand,
	},
];

/**
 * The sub-command a command line runs (`help X` counts as X), or undefined for none: the console,
 * `--version`, `--help` or a word that is not a command.
 */
export function commandNamed(args: readonly string[]): CommandEntry | undefined {
	const word = commandWord(args);
	return commandList.find((c) => c.name === word);
}
