/**
 * The built-in region templates: the read-only plan files in the package's `presets/` folder. The
 * file name (without `.json`) is the template id; each is checked against the plan format at load.
 */
import {readdirSync, readFileSync} from 'node:fs';
import {dirname, join} from 'node:path';
import {fileURLToPath} from 'node:url';
import {parsePlanDocument, type PlanDocument} from '../plan/plan-schema.js';
import {maxPlanBytes} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {readJsonFile} from '../files/json-input.js';

/** Template ids are plain slugs, so they can never look like a user id (`user:…`). */
export const templateIdPattern = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

/** One built-in template: its id (the file name), file and validated plan. */
export interface Template {
	readonly id: string;
	readonly file: string;
	readonly plan: PlanDocument;
}

/**
 * The directory holding this package's package.json, found by walking up from this module, so it
 * works from `src/store/` (tests) and from `dist/src/store/` (built) alike.
 */
export function packageRoot(from: string = dirname(fileURLToPath(import.meta.url))): string {
	let dir = from;
	for (;;) {
		try {
			const pkg = JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8')) as {name?: unknown};
			if (pkg.name === 'evenecho') return dir;
		} catch {
			// No package.json here (or not ours): keep walking up.
		}
		const parent = dirname(dir);
		if (parent === dir) throw new Error(`cannot find the evenecho package root above ${from}`);
		dir = parent;
	}
}

/** Where the templates live. */
export function templatesDir(): string {
	return join(packageRoot(), 'presets');
}

let cached: {templates: Template[]; problems: string[]} | undefined;

/** Loads (once per process) and validates every template; broken ones are reported, not thrown. */
export function loadTemplates(dir?: string): {templates: Template[]; problems: string[]} {
	if (!dir && cached) return cached;
	const where = dir ?? templatesDir();
	const templates: Template[] = [];
	const problems: string[] = [];
	let names: string[];
	try {
		names = readdirSync(where)
			.filter((n) => n.endsWith('.json'))
			.sort();
	} catch (error) {
		names = [];
		problems.push(
			`templates folder ${where} cannot be read (${(error as NodeJS.ErrnoException).code ?? 'error'}); only user presets are available`,
		);
	}
	for (const fileName of names) {
		const id = fileName.slice(0, -'.json'.length);
		const file = join(where, fileName);
		if (!templateIdPattern.test(id)) {
			problems.push(`template ${file}: the file name must be lower-case letters, digits and hyphens; skipped`);
			continue;
		}
		let value: unknown;
		try {
			value = readJsonFile(file, {maxBytes: maxPlanBytes, followLinks: false, what: 'template'}).value;
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			problems.push(`template ${id}: ${error.message}; skipped`);
			continue;
		}
		const plan = parsePlanDocument(value);
		if (!plan.ok) {
			problems.push(`template ${id} (${file}) does not validate; skipped: ${plan.errors.join('; ')}`);
			continue;
		}
		templates.push({id, file, plan: plan.value});
	}
	const result = {templates, problems};
	if (!dir) cached = result;
	return result;
}
