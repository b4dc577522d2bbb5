/**
 * The one table of keys. Every key the console understands is here, with the modes it works in
 * and the words the help overlay shows; the reducer turns a key press into an intent through it.
 * Pure: the flags are a subset of Ink's `Key`, so Ink's object can be passed straight in.
 */

export interface KeyFlags {
	readonly upArrow: boolean;
	readonly downArrow: boolean;
	readonly leftArrow: boolean;
	readonly rightArrow: boolean;
	readonly pageUp: boolean;
	readonly pageDown: boolean;
	readonly return: boolean;
	readonly escape: boolean;
	readonly tab: boolean;
	readonly backspace: boolean;
	readonly delete: boolean;
	readonly ctrl: boolean;
	readonly shift: boolean;
	readonly meta: boolean;
}

/**
 * What the user is doing, which decides what a key means. `sweep` is the fat-thickness table of step 5, `edit-list`
 * typing its list; `scanner` the measured-scanner panel, `edit-path` typing its session file; `refine-pick` typing
 * the still's path for refine, `refine` its result.
 */
export const modes = [
	'browse',
	'stack',
	'curve-pane',
	'edit-number',
	'edit-text',
	'edit-list',
	'tissue',
	'ask',
	'overlay',
	'sweep',
	'scanner',
	'edit-path',
	'refine-pick',
	'refine',
] as const;
export type Mode = (typeof modes)[number];

export type Intent =
	| 'exit-now'
	| 'up'
	| 'down'
	| 'prev-step'
	| 'next-step'
	| 'jump'
	| 'pane'
	| 'enter'
	| 'back'
	| 'nudge-up'
	| 'nudge-down'
	| 'coarse-up'
	| 'coarse-down'
	| 'help'
	| 'warnings'
	| 'quit'
	| 'save'
	| 'export'
	| 'layer-add'
	| 'layer-remove'
	| 'layer-up'
	| 'layer-down'
	| 'tissue'
	| 'sweep'
	| 'scroll-left'
	| 'scroll-right'
	| 'page-up'
	| 'page-down'
	| 'toggle-delta'
	| 'picture'
	| 'yes'
	| 'no'
	| 'erase'
	| 'type'
	| 'undo'
	| 'redo'
	| 'thickness-mode'
	| 'scanner'
	| 'measure'
	| 'keep'
	| 'keep-replace'
	| 'refine-image'
	| 'accept'
	| 'compare';

export type Section =
	| 'Moving around'
	| 'Changing a value'
	| 'Typing a value'
	| 'Tissue stack'
	| 'The plan'
	| 'Questions';

export interface Binding {
	/** As shown in the help overlay. */
	readonly keys: string;
	readonly help: string;
	/** One or two words for the hint line; bindings without one appear only in the help overlay. */
	readonly hint?: string;
	readonly section: Section;
	readonly modes: readonly Mode[];
	/** The intent this key means, or undefined when the binding does not apply to it. */
	readonly pick: (input: string, key: KeyFlags) => Intent | undefined;
}

const browsing: readonly Mode[] = ['browse', 'stack', 'curve-pane'];
const stepping: readonly Mode[] = ['browse', 'stack'];
const typing: readonly Mode[] = ['edit-number', 'edit-text', 'edit-list', 'edit-path', 'refine-pick'];
const every: readonly Mode[] = modes;

const plain = (key: KeyFlags) => !key.ctrl && !key.meta;
const is = (c: string, intent: Intent) => (input: string, key: KeyFlags) =>
	input === c && plain(key) ? intent : undefined;
const when = (test: boolean, intent: Intent) => (test ? intent : undefined);

export const bindings: readonly Binding[] = [
	{
		keys: 'Ctrl+C',
		help: 'leave now, no saving',
		section: 'The plan',
		modes: every,
		pick: (i, k) => when(k.ctrl && i === 'c', 'exit-now'),
	},
	// Esc first: on Ink 6.8 a lone Esc also sets `meta`.
	{
		keys: 'Esc',
		hint: 'back',
		help: 'back, cancel or close',
		section: 'Moving around',
		modes: [...browsing, ...typing, 'tissue', 'overlay', 'sweep', 'scanner', 'refine'],
		pick: (_i, k) => when(k.escape, 'back'),
	},
	// One help line for the answers and the refine panel's accept, so the overlay still fits 80×24 whole.
	{
		keys: 'y  n Esc  a',
		hint: 'yes, n no',
		help: 'yes / no; a: accept α0',
		section: 'Questions',
		modes: ['ask', 'refine'],
		pick: (i, k) =>
			(i === 'y' || i === 'Y') && plain(k)
				? 'yes'
				: k.escape || ((i === 'n' || i === 'N') && plain(k))
					? 'no'
					: i === 'a' && plain(k)
						? 'accept'
						: undefined,
	},
	{
		keys: 'K J  Shift+↑↓',
		help: 'move layer up / down',
		section: 'Tissue stack',
		modes: ['stack'],
		pick: (i, k) =>
			i === 'K' || (k.upArrow && k.shift)
				? 'layer-up'
				: i === 'J' || (k.downArrow && k.shift)
					? 'layer-down'
					: undefined,
	},
	{
		keys: '↑ ↓  k j',
		help: 'previous / next row',
		section: 'Moving around',
		modes: [...browsing, 'tissue', 'sweep', 'scanner'],
		pick: (i, k) =>
			k.upArrow || (i === 'k' && plain(k)) ? 'up' : k.downArrow || (i === 'j' && plain(k)) ? 'down' : undefined,
	},
	{
		keys: '↑↓  PgUp PgDn',
		hint: 'nudge',
		help: 'nudge; PgUp/Dn big',
		section: 'Typing a value',
		modes: ['edit-number'],
		pick: (_i, k) =>
			k.upArrow
				? 'nudge-up'
				: k.downArrow
					? 'nudge-down'
					: k.pageUp
						? 'coarse-up'
						: k.pageDown
							? 'coarse-down'
							: undefined,
	},
	{
		keys: 'Enter',
		hint: 'edit',
		help: 'edit, choose, confirm',
		section: 'Moving around',
		modes: [...browsing, ...typing, 'tissue', 'sweep', 'scanner', 'refine'],
		pick: (_i, k) => when(k.return, 'enter'),
	},
	{
		keys: 'Backspace',
		help: 'erase a character',
		section: 'Typing a value',
		modes: [...typing, 'tissue'],
		pick: (_i, k) => when(k.backspace || k.delete, 'erase'),
	},
	{
		keys: '0-9 . - a-z',
		help: 'type; filters tissues',
		section: 'Typing a value',
		modes: [...typing, 'tissue'],
		pick: (i, k) => when(i.length > 0 && !k.ctrl && !k.meta && !k.tab, 'type'),
	},
	{
		keys: '← →  h l',
		help: 'previous / next step',
		section: 'Moving around',
		modes: [...browsing, 'scanner', 'overlay'],
		pick: (i, k) =>
			k.leftArrow || (i === 'h' && plain(k))
				? 'prev-step'
				: k.rightArrow || (i === 'l' && plain(k))
					? 'next-step'
					: undefined,
	},
	{
		keys: '←→ PgUp PgDn',
		help: 'scroll the sweep table',
		section: 'Moving around',
		modes: ['sweep'],
		pick: (_i, k) =>
			k.leftArrow
				? 'scroll-left'
				: k.rightArrow
					? 'scroll-right'
					: k.pageUp
						? 'page-up'
						: k.pageDown
							? 'page-down'
							: undefined,
	},
	{
		keys: '1-5',
		help: 'jump to a step',
		section: 'Moving around',
		modes: browsing,
		pick: (i, k) => when(/^[1-5]$/.test(i) && plain(k), 'jump'),
	},
	{
		keys: 'Tab',
		hint: 'curve',
		help: 'step/curve pane; field',
		section: 'Moving around',
		modes: [...browsing, 'refine-pick'],
		pick: (_i, k) => when(k.tab, 'pane'),
	},
	// One help line for both nudges, so the overlay still fits 80×24 whole with the refine and scanner keys.
	{
		keys: '+ -  ] [',
		help: 'nudge; ] [ a big step',
		section: 'Changing a value',
		modes: stepping,
		pick: (i, k) => {
			if (!plain(k)) return undefined;
			const intents: Record<string, Intent> = {
				'+': 'nudge-up',
				'=': 'nudge-up',
				'-': 'nudge-down',
				']': 'coarse-up',
				'[': 'coarse-down',
			};
			return Object.hasOwn(intents, i) ? intents[i] : undefined;
		},
	},
	{
		keys: 'd',
		hint: 'deltas',
		help: 'sweep: values / deltas',
		section: 'Changing a value',
		modes: ['sweep'],
		pick: is('d', 'toggle-delta'),
	},
	{
		keys: 'a',
		hint: 'add',
		help: 'add a layer below',
		section: 'Tissue stack',
		modes: ['stack'],
		pick: is('a', 'layer-add'),
	},
	{
		keys: 'x',
		hint: 'remove',
		help: 'remove the layer',
		section: 'Tissue stack',
		modes: ['stack'],
		pick: is('x', 'layer-remove'),
	},
	{
		keys: 't',
		hint: 'tissue',
		help: 'tissue from the library',
		section: 'Tissue stack',
		modes: ['stack'],
		pick: is('t', 'tissue'),
	},
	{
		keys: 'u  Ctrl+R',
		hint: 'undo',
		help: 'undo / redo an edit',
		section: 'The plan',
		modes: browsing,
		pick: (i, k) => (i === 'u' && plain(k) ? 'undo' : k.ctrl && i === 'r' ? 'redo' : undefined),
	},
	{
		keys: 'm',
		hint: 'screen/true',
		help: 'thickness screen/true',
		section: 'Tissue stack',
		modes: ['stack'],
		pick: is('m', 'thickness-mode'),
	},
	{keys: 's', hint: 'save', help: 'save as a preset', section: 'The plan', modes: browsing, pick: is('s', 'save')},
	{
		keys: 'e',
		hint: 'export',
		help: 'export plan or table',
		section: 'The plan',
		modes: [...browsing, 'sweep'],
		pick: is('e', 'export'),
	},
	// One help line for the sweep and the measured-scanner panel with its own keys (c measures, s/S keep;
	// the panel names them itself), so the overlay still fits 80×24 whole.
	{
		keys: 'f  g (c s)',
		help: 'fat sweep; scanner',
		section: 'The plan',
		modes: [...browsing, 'scanner'],
		pick: (i, k) => {
			if (!plain(k)) return undefined;
			const intents: Record<string, Intent> = {f: 'sweep', g: 'scanner', c: 'measure', s: 'keep', S: 'keep-replace'};
			return Object.hasOwn(intents, i) ? intents[i] : undefined;
		},
	},
	// One help line for both, so the overlay still fits 80×24 whole. At 80 columns p also cycles to the slider bank.
	{
		keys: 'w  p  v',
		help: 'warnings; picture; vs.',
		section: 'The plan',
		modes: browsing,
		pick: (i, k) => is('w', 'warnings')(i, k) ?? is('p', 'picture')(i, k) ?? is('v', 'compare')(i, k),
	},
	{keys: 'i', help: 'refine from an image', section: 'The plan', modes: browsing, pick: is('i', 'refine-image')},
	{
		keys: '?',
		hint: 'keys',
		help: 'this list of keys',
		section: 'The plan',
		modes: [...browsing, 'overlay', 'sweep', 'refine'],
		pick: is('?', 'help'),
	},
	{
		keys: 'q',
		hint: 'quit',
		help: 'quit (asks if unsaved)',
		section: 'The plan',
		modes: [...browsing, 'sweep'],
		pick: is('q', 'quit'),
	},
];

export interface Resolved {
	readonly intent: Intent;
	readonly input: string;
}

/** The first binding of this mode that matches, or undefined (the key does nothing). */
export function resolveIntent(mode: Mode, input: string, key: KeyFlags): Resolved | undefined {
	for (const b of bindings) {
		if (!b.modes.includes(mode)) continue;
		const intent = b.pick(input, key);
		if (intent) return {intent, input};
	}
	return undefined;
}

/** A key press with no flags set, for tests and the bench. */
export const noFlags: KeyFlags = {
	upArrow: false,
	downArrow: false,
	leftArrow: false,
	rightArrow: false,
	pageUp: false,
	pageDown: false,
	return: false,
	escape: false,
	tab: false,
	backspace: false,
	delete: false,
	ctrl: false,
	shift: false,
	meta: false,
};

/**
 * Hint-line entries for a mode, in table order: `keys word`. Arrow names are shortened. `page`
 * names a page of the mode whose keys differ: the scanner panel's results (pages, keep, no Enter).
 */
export function hintsFor(mode: Mode, page?: 'scanner-result'): string[] {
	const extra: Partial<Record<Mode, string[]>> = {
		browse: ['↑↓ move', '+/- nudge', '←→ step'],
		stack: ['↑↓ move', 'J/K reorder', '+/- thickness'],
		'curve-pane': ['↑↓ slider'],
		'edit-number': ['type digits', 'Enter apply'],
		'edit-text': ['type text', 'Enter done'],
		'edit-list': ['type a list', 'Enter apply'],
		sweep: ['↑↓ rows', '←→ columns'],
		tissue: ['type to filter', '↑↓ move', 'Enter pick'],
		overlay: ['Esc close'],
		scanner:
			page === 'scanner-result' ? ['←→ page', 's keep', 'S keep, replacing'] : ['↑↓ move', 'Enter pick', '←→ page'],
		'edit-path': ['type a path', 'Enter measure'],
		'refine-pick': ['type a path', 'Tab next field', 'Enter measure'],
		refine: ['a accept', 'Enter another image'],
	};
	const noEnterHint = (m: Mode): boolean =>
		m.startsWith('edit') || m.startsWith('refine') || m === 'tissue' || m === 'curve-pane' || m === 'scanner';
	const fromTable = bindings
		.filter((b) => b.hint && b.modes.includes(mode) && !(noEnterHint(mode) && b.keys === 'Enter'))
		.map((b) => `${b.keys.split('  ')[0]} ${b.hint}`);
	// The form's Tab moves between its fields (said in its own hint), not to the curve.
	return [
		...(extra[mode] ?? []),
		...fromTable.filter(
			(h) =>
				!(mode === 'overlay' && h.startsWith('Esc')) &&
				!(mode === 'refine-pick' && h.startsWith('Tab')) &&
				!(mode === 'refine' && h.startsWith('y ')),
		),
	];
}

/**
 * Ink hands a run of plain characters over as one input (a paste, or keys that arrived together
 * while the console was busy, or `tmux send-keys`): "\r7" would be neither Enter nor 7. Split such
 * a run into one key press per character, with the flags a lone key would have had.
 */
export function splitKeys(input: string, key: KeyFlags): {input: string; key: KeyFlags}[] {
	// No key here means anything with Alt, so Esc read together with the next key (Ink reports
	// that as meta + key) is taken as the Esc it was, then that key.
	if (key.meta && !key.escape)
		return [{input: '', key: {...noFlags, escape: true, meta: true}}, ...splitKeys(input, {...key, meta: false})];
	const flagged = (Object.keys(noFlags) as (keyof KeyFlags)[]).some((k) => key[k]);
	if ([...input].length <= 1 || flagged || input.includes('\u001B')) return [{input, key}];
	return [...input].map((ch) => {
		if (ch === '\r' || ch === '\n') return {input: '', key: {...noFlags, return: true}};
		if (ch === '\t') return {input: '', key: {...noFlags, tab: true}};
		if (ch === '\u007F') return {input: '', key: {...noFlags, delete: true}};
		if (ch === '\b') return {input: '', key: {...noFlags, backspace: true}};
		const code = ch.codePointAt(0)!;
		// Ctrl+letter arrives as 1-26.
		if (code >= 1 && code <= 26) return {input: String.fromCodePoint(code + 96), key: {...noFlags, ctrl: true}};
		return {input: ch, key: {...noFlags, shift: /^[A-Z]$/.test(ch)}};
	});
}
