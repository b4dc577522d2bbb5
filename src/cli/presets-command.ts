/**
 * `evenecho presets …`: the built-in region templates and the user's own presets.
 *
 * Data (tables, JSON, ids of what was written) goes to stdout; messages, notices and problems to
 * stderr. Bad input is a UsageError (store errors are UsageErrors too): exit code 2.
 */
import type {Command} from 'commander';
import {computeCurve} from '../engine/compensation-curve.js';
import {resolvePlan} from '../plan/resolve-plan.js';
import {curveSummary} from '../report/curve-summary.js';
import type {Preset, PresetStore, PresetSummary} from '../store/preset-store.js';
import {printable, printableLines} from '../files/printable.js';
import {presetSlug} from '../store/safe-name.js';
import {loadTemplates} from '../store/templates.js';
import {readJsonInputOrRefuse, readPlanFile} from './read-plan-file.js';
import {UsageError} from '../errors/usage-error.js';
import {choiceOption} from './choice-option.js';
import {writeOutput} from './write-output.js';

const formats = ['text', 'json'] as const;

/** Messages quote names and file paths: printable, so nothing from a file drives the terminal. */
function say(message: string): void {
	process.stderr.write(`evenecho: ${printable(message, 2000)}\n`);
}

/**
 * Opens the store for one command and prints its notices afterwards, also when the command fails.
 * Loaded on demand so that other commands do not pay for `conf` at start-up.
 */
async function withStore<T>(work: (store: PresetStore) => T | Promise<T>): Promise<T> {
	const {openPresetStore} = await import('../store/preset-store.js');
	const store = openPresetStore();
	try {
		return await work(store);
	} finally {
		for (const notice of store.notices) say(`note: ${notice}`);
	}
}

const width = (s: string) => [...s].length;
const pad = (s: string, n: number) => s + ' '.repeat(Math.max(0, n - width(s)));

/** The `list` table: one preset a line, templates first. */
export function presetTable(presets: readonly PresetSummary[]): string {
	const rows = [
		['id', 'name', 'region', 'kind'],
		...presets.map((p) => [
			printable(p.id),
			printable(p.name),
			printable(p.region),
			p.isTemplate ? 'template' : 'user preset',
		]),
	];
	const widths = [0, 1, 2].map((c) => Math.max(...rows.map((r) => width(r[c]!))));
	return (
		rows
			.map((r) =>
				r
					.map((cell, c) => (c < 3 ? pad(cell, widths[c]! + 2) : cell))
					.join('')
					.trimEnd(),
			)
			.join('\n') + '\n'
	);
}

/** Wraps prose to the terminal's usual 80 columns, indented. */
function wrap(text: string, indent = '  ', columns = 80): string {
	const lines: string[] = [];
	let line = '';
	for (const word of text.split(/\s+/).filter(Boolean)) {
		if (line && width(indent + line + ' ' + word) > columns) {
			lines.push(indent + line);
			line = word;
		} else {
			line = line ? `${line} ${word}` : word;
		}
	}
	if (line) lines.push(indent + line);
	return lines.join('\n');
}

/** The text form of `show`: who the preset is, its note, then the curve it gives. */
export function presetDescription(p: Preset): string {
	const out: string[] = [];
	out.push(`${printable(p.id)}  "${printable(p.name)}"  [${printable(p.region)}]`);
	const saved = p.savedAt ? `, saved ${p.savedAt}` : '';
	const migrated = p.migratedFrom ? `; stored as record version ${p.migratedFrom}, read as the current version` : '';
	out.push(
		p.isTemplate
			? `  built-in template, read-only (${p.file}); "evenecho presets copy ${p.id} <name>" makes your own copy`
			: `  user preset (${p.file})${saved}${migrated}`,
	);
	for (const problem of p.problems ?? []) out.push(`  ! ${printable(problem, 400)}`);
	if (p.plan.note) {
		out.push('');
		out.push(wrap(printableLines(p.plan.note)));
	}
	out.push('');
	return out.join('\n') + '\n' + curveSummary(computeCurve(resolvePlan(p.plan)));
}

function presetJson(p: Preset) {
	return {
		id: p.id,
		name: p.name,
		region: p.region,
		isTemplate: p.isTemplate,
		file: p.file,
		...(p.savedAt ? {savedAt: p.savedAt} : {}),
		...(p.problems?.length ? {problems: p.problems} : {}),
		plan: p.plan,
	};
}

/** Templates whose name (or id) is the same preset name as `name`. */
function templatesNamed(name: string) {
	const slug = presetSlug(name);
	return loadTemplates().templates.filter((t) => t.id === slug || presetSlug(t.plan.name) === slug);
}

/** When your preset answers to a name a template also has, say how to reach the template. */
function shadowNote(found: Preset, query: string): void {
	if (found.isTemplate || query === found.id) return;
	for (const t of templatesNamed(query))
		say(`a built-in template also answers to "${query}"; show it by its id: evenecho presets show ${t.id}`);
}

/** Adds `presets list|show|save|rename|copy|delete|export|import` to the program. */
export function registerPresetsCommand(program: Command): void {
	const presets = program
		.command('presets')
		.description(
			'built-in region templates and your own presets (list, show, save, rename, copy, delete, export, import)',
		);

	presets
		.command('list')
		.description('list the templates and your presets, with their ids')
		.option('--format <format>', 'text or json', 'text')
		.action(async (opts: {format: string}) => {
			const format = choiceOption('format', opts.format, formats);
			await withStore((store) => {
				const {presets: all, problems} = store.list();
				if (format === 'json') {
					process.stdout.write(JSON.stringify({store: store.home, presets: all, problems}, null, 2) + '\n');
				} else {
					process.stdout.write(presetTable(all));
					const users = all.filter((p) => !p.isTemplate).length;
					say(`${all.length - users} templates, ${users} user preset${users === 1 ? '' : 's'} (store: ${store.home})`);
				}
				for (const problem of problems) say(`problem: ${problem}`);
			});
		});

	presets
		.command('show')
		.description('show one preset: its plan and the curve it gives')
		.argument('<preset>', 'id or name')
		.option('--format <format>', 'text (plan and curve summary) or json (the preset and its plan)', 'text')
		.action(async (query: string, opts: {format: string}) => {
			const format = choiceOption('format', opts.format, formats);
			await withStore((store) => {
				const found = store.get(query);
				if (format === 'json') process.stdout.write(JSON.stringify(presetJson(found), null, 2) + '\n');
				else process.stdout.write(presetDescription(found));
				shadowNote(found, query);
			});
		});

	presets
		.command('save')
		.description('save a plan file as one of your presets (refuses to replace one unless --force)')
		.argument('<name>', 'preset name')
		.requiredOption('--from <plan>', 'plan file (JSON, format evenecho-plan/1) or - for standard input')
		.option('--force', 'replace your preset of the same name')
		.action(async (name: string, opts: {from: string; force?: boolean}) => {
			const {doc} = await readPlanFile(opts.from);
			await withStore((store) => {
				const saved = store.save(name, doc, {overwrite: opts.force === true});
				say(`saved "${saved.name}" as ${saved.id} (${saved.file})`);
				templateNote(saved);
				process.stdout.write(`${saved.id}\n`);
			});
		});

	presets
		.command('rename')
		.description('rename one of your presets (templates are read-only)')
		.argument('<from>', 'id or name')
		.argument('<to>', 'new name')
		.option('--force', 'replace your preset that already has the new name')
		.action(async (from: string, to: string, opts: {force?: boolean}) => {
			await withStore((store) => {
				const renamed = store.rename(from, to, {overwrite: opts.force === true});
				say(`renamed to "${renamed.name}" (${renamed.id})`);
				process.stdout.write(`${renamed.id}\n`);
			});
		});

	presets
		.command('copy')
		.description('copy a template or preset as a new preset of yours')
		.argument('<from>', 'id or name')
		.argument('<to>', 'name of the copy')
		.option('--force', 'replace your preset that already has this name')
		.action(async (from: string, to: string, opts: {force?: boolean}) => {
			await withStore((store) => {
				const copied = store.copy(from, to, {overwrite: opts.force === true});
				say(`copied to "${copied.name}" (${copied.id})`);
				templateNote(copied);
				process.stdout.write(`${copied.id}\n`);
			});
		});

	presets
		.command('delete')
		.description('delete one of your presets (templates are read-only)')
		.argument('<preset>', 'id or name')
		.action(async (query: string) => {
			await withStore((store) => {
				const removed = store.remove(query);
				say(`deleted "${removed.name}" (${removed.id})`);
			});
		});

	presets
		.command('export')
		.description('write presets to a bundle file (all of yours when none are named; - writes to standard output)')
		.argument('<file>', 'bundle file to write, or -')
		.argument('[presets...]', 'ids or names (templates too)')
		.option('--force', 'replace the file if it exists')
		.action(async (file: string, queries: string[], opts: {force?: boolean}) => {
			await withStore(async (store) => {
				if (file === '-') {
					const bundle = store.exportBundle(queries);
					await writeOutput(bundle.text);
					say(`exported ${countOf(bundle.presets.length)}`);
					return;
				}
				const done = store.exportTo(file, queries, {overwrite: opts.force === true});
				say(`exported ${countOf(done.presets.length)} to ${done.file}`);
			});
		});

	presets
		.command('import')
		.description('import one plan (named by its "name") or a bundle as your presets; - reads standard input')
		.argument('<file>', 'plan or bundle file, or -')
		.option('--force', 'replace your presets of the same names')
		.action(async (file: string, opts: {force?: boolean}) => {
			// Read first (asynchronously for standard input, so signals work while it waits).
			const value = await readJsonInputOrRefuse(file, 'preset file').catch((error: unknown) => {
				throw error instanceof UsageError ? new UsageError(`${error.message}; nothing was imported`) : error;
			});
			await withStore((store) => {
				const imported = store.importDocument(value, file === '-' ? 'standard input' : printable(file), {
					overwrite: opts.force === true,
				});
				say(`imported ${countOf(imported.length)}: ${imported.map((p) => `"${p.name}" (${p.id})`).join(', ')}`);
				for (const p of imported) process.stdout.write(`${p.id}\n`);
			});
		});
}

function countOf(n: number): string {
	return `${n} preset${n === 1 ? '' : 's'}`;
}

/** After saving under a template's name: the template is untouched, and this is how to tell them apart. */
function templateNote(saved: Preset): void {
	for (const t of templatesNamed(saved.name))
		say(`the built-in template ${t.id} stays as it is; your copy is ${saved.id}`);
}
