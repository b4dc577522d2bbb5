/**
 * Keys and effect results of the measured-scanner panel (key `g`): pick a stored scanner profile
 * for the plan (or none: the assumed built-in ramp), or measure one from a session file, page
 * through what was measured (the images with the measured region, grey map, depth response,
 * penetration) and keep it. Pure: reading files and the store are effects the app carries out.
 */
import type {ScannerProfile} from '../../calibration/profile-document.js';
import {clonePlan} from '../../plan/plan-edits.js';
import type {ConsoleState} from './console-state.js';
import type {Intent} from './key-intents.js';
import {
	measurePages,
	type KeepNaming,
	type ScannerAction,
	type ScannerOverlay,
	type ScannerPanel,
} from './scanner-state.js';
import {buildSession, labelFor, needsPixelScale} from './session-builder.js';
import {applyDoc, queue, withNotice} from './state-helpers.js';
import {eraseIn, openEntry, printableChars, typeInto} from './text-entry.js';

/** Longest session path the panel takes. */
const pathMax = 1000;
/** Longest profile name the store takes (its own check says so in full). */
const profileNameMax = 60;

/** The list row of the plan's current choice: 0 is "none", then the profiles in order. */
function rowOf(profiles: readonly ScannerProfile[], id: string | undefined): number {
	return id === undefined ? 0 : Math.max(0, profiles.findIndex((p) => p.id === id) + 1);
}

export function openScannerPanel(s: ConsoleState): ConsoleState {
	const overlay: ScannerOverlay = {kind: 'scanner', panel: {kind: 'list', cursor: 0}, profiles: null, problems: []};
	return queue({...s, overlay, refusal: null}, {kind: 'scanner-list'});
}

const withPanel = (s: ConsoleState, o: ScannerOverlay, panel: ScannerPanel): ConsoleState => ({
	...s,
	overlay: {...o, panel},
});
/** The overlay without a remembered builder (a new measurement starts from elsewhere). */
function fresh(o: ScannerOverlay): ScannerOverlay {
	const {built: _, ...rest} = o;
	return rest;
}

/** Names the profile in the plan (or removes the name): one plan edit, undone with `u` like any other. */
export function chooseScanner(s: ConsoleState, id: string | null): ConsoleState {
	const closed = {...s, overlay: null};
	if ((id ?? undefined) === s.doc.scanner) return withNotice(closed, 'The plan already uses that; nothing changed.');
	const next = clonePlan(s.doc);
	if (id === null) delete next.scanner;
	else next.scanner = id;
	const after = applyDoc(closed, next, 'scanner');
	if (after.doc === s.doc) return withNotice(after, `Not taken: ${after.refusal?.message ?? 'refused'}`, 'warning');
	return withNotice(
		after,
		id === null
			? 'The plan uses the assumed built-in ramp again (u undoes).'
			: `The plan now uses the measured scanner "${id}": sliders in dB and as a fraction of travel (u undoes).`,
		'done',
	);
}

/** Keys while the panel is open (modes `scanner` and, while typing the path, `edit-path`). */
export function scannerIntent(s: ConsoleState, o: ScannerOverlay, intent: Intent, input: string): ConsoleState {
	const p = o.panel;
	switch (p.kind) {
		case 'list': {
			const rows = (o.profiles?.length ?? 0) + 1;
			if (intent === 'back') return {...s, overlay: null};
			if (intent === 'up' || intent === 'down') {
				const cursor = Math.max(0, Math.min(rows - 1, p.cursor + (intent === 'up' ? -1 : 1)));
				return withPanel(s, o, {...p, cursor});
			}
			if (intent === 'enter' && o.profiles)
				return chooseScanner(s, p.cursor === 0 ? null : o.profiles[p.cursor - 1]!.id);
			if (intent === 'measure') return withPanel(s, o, {kind: 'path', text: ''});
			return s;
		}
		case 'path': {
			if (intent === 'back') return withPanel(s, o, {kind: 'list', cursor: rowOf(o.profiles ?? [], s.doc.scanner)});
			if (intent === 'erase') return withPanel(s, o, {kind: 'path', text: p.text.slice(0, -1)});
			if (intent === 'type') {
				const typed = [...input].filter((c) => c >= ' ' && c !== '\u007F').join('');
				return withPanel(s, o, {kind: 'path', text: (p.text + typed).slice(0, pathMax)});
			}
			if (intent === 'enter') {
				const path = p.text.trim();
				if (!path)
					return withPanel(s, o, {...p, error: 'session file: type the path of an evenecho-scanner-session/1 file'});
				return queue(withPanel(s, fresh(o), {kind: 'measuring', path}), {kind: 'scanner-measure', path});
			}
			return s;
		}
		case 'measuring':
			return s;
		case 'build':
			return buildIntent(s, o, p, intent, input);
		case 'result': {
			if (p.naming) return namingIntent(s, o, p, p.naming, intent, input);
			if (intent === 'back') return withPanel(s, o, {kind: 'list', cursor: rowOf(o.profiles ?? [], s.doc.scanner)});
			if (intent === 'prev-step' || intent === 'next-step') {
				const page = Math.max(0, Math.min(measurePages.length - 1, p.page + (intent === 'prev-step' ? -1 : 1)));
				return withPanel(s, o, {...p, page});
			}
			if (intent === 'keep' || intent === 'keep-replace') {
				const {message: _, ...rest} = p;
				const naming = {...openEntry(p.name ?? p.cal.label), replace: intent === 'keep-replace'};
				return withPanel(s, o, {...rest, naming});
			}
			return s;
		}
	}
}

type ResultPanel = ScannerPanel & {kind: 'result'};

/** Keys while typing the name a measurement is kept under: the console's shared text entry. */
function namingIntent(
	s: ConsoleState,
	o: ScannerOverlay,
	p: ResultPanel,
	naming: KeepNaming,
	intent: Intent,
	input: string,
): ConsoleState {
	const {naming: _, ...panel} = p;
	const {error: __, ...entry} = naming;
	switch (intent) {
		case 'back':
			return withPanel(s, o, panel);
		case 'type':
			return withPanel(s, o, {...panel, naming: {...entry, ...typeInto(entry, printableChars(input), profileNameMax)}});
		case 'erase':
			return withPanel(s, o, {...panel, naming: {...entry, ...eraseIn(entry)}});
		case 'enter': {
			const name = naming.text.trim();
			if (!name)
				return withPanel(s, o, {...p, naming: {...entry, error: `name: type 1 to ${profileNameMax} characters`}});
			const {message: ___, ...rest} = panel;
			return queue(withPanel(s, o, {...rest, name}), {kind: 'scanner-keep', cal: p.cal, replace: naming.replace, name});
		}
		default:
			return s;
	}
}

/** The outcome of a panel effect. */
export function scannerResult(s: ConsoleState, a: ScannerAction): ConsoleState {
	const o = s.overlay;
	if (o?.kind !== 'scanner') return a.type === 'scanner-refused' ? withNotice(s, a.message, 'warning') : s;
	switch (a.type) {
		case 'scanner-profiles': {
			const next = {...o, profiles: a.profiles, problems: a.problems};
			const cursor = rowOf(a.profiles, a.kept ?? s.doc.scanner);
			const opened =
				o.panel.kind === 'list' || a.kept !== undefined
					? withPanel(s, next, {kind: 'list', cursor})
					: {...s, overlay: next};
			return a.kept === undefined
				? opened
				: withNotice(opened, `Kept the scanner profile "${a.kept}"; Enter names it in this plan.`, 'done');
		}
		case 'scanner-folder':
			if (o.panel.kind !== 'measuring') return s;
			if (!a.images.length)
				return withPanel(s, o, {
					kind: 'path',
					text: o.panel.path,
					error: `${a.folder}: no DICOM (.dcm) or PNG (.png) images here`,
				});
			return withPanel(s, o, {
				kind: 'build',
				folder: a.folder,
				images: a.images.map((name) => ({name, entry: ''})),
				cursor: 0,
				typing: null,
				...(a.images.some(needsPixelScale) ? {scale: ''} : {}),
			});
		case 'scanner-measured':
			return o.panel.kind === 'measuring'
				? withPanel(s, fresh(o), {kind: 'result', path: a.path, input: a.input, cal: a.cal, page: 0})
				: s;
		case 'scanner-refused':
			if (o.panel.kind === 'measuring' && o.built) return withPanel(s, o, {...o.built, error: a.message});
			if (o.panel.kind === 'measuring') return withPanel(s, o, {kind: 'path', text: o.panel.path, error: a.message});
			if (o.panel.kind === 'result') return withPanel(s, o, {...o.panel, message: a.message});
			return withNotice(s, a.message, 'warning');
	}
}

type BuildPanel = ScannerPanel & {kind: 'build'};

/** Keys while building a session from a folder's images: move, type each image's line, measure. */
function buildIntent(s: ConsoleState, o: ScannerOverlay, p: BuildPanel, intent: Intent, input: string): ConsoleState {
	const {error: _, ...panel} = p;
	// Rows: the images, then the depth-scale line when the folder has PNG images, then "measure".
	const scaleRow = p.scale === undefined ? -1 : p.images.length;
	const lastRow = p.images.length + (p.scale === undefined ? 0 : 1);
	if (p.typing !== null) {
		if (intent === 'back') return withPanel(s, o, {...panel, typing: null});
		if (intent === 'erase') return withPanel(s, o, {...panel, typing: p.typing.slice(0, -1)});
		if (intent === 'type')
			return withPanel(s, o, {
				...panel,
				typing: (p.typing + [...input].filter((c) => c >= ' ' && c !== '\u007F').join('')).slice(0, 40),
			});
		if (intent === 'enter') {
			if (p.cursor === scaleRow) return withPanel(s, o, {...panel, scale: p.typing, typing: null, cursor: lastRow});
			const images = p.images.map((im, i) => (i === p.cursor ? {...im, entry: p.typing!} : im));
			return withPanel(s, o, {...panel, images, typing: null, cursor: Math.min(lastRow, p.cursor + 1)});
		}
		return s;
	}
	if (intent === 'back') return withPanel(s, o, {kind: 'path', text: p.folder});
	if (intent === 'up' || intent === 'down') {
		const cursor = Math.max(0, Math.min(lastRow, p.cursor + (intent === 'up' ? -1 : 1)));
		return withPanel(s, o, {...panel, cursor});
	}
	if (intent !== 'enter') return s;
	if (p.cursor < p.images.length) return withPanel(s, o, {...panel, typing: p.images[p.cursor]!.entry});
	if (p.cursor === scaleRow) return withPanel(s, o, {...panel, typing: p.scale ?? ''});
	const folderName =
		p.folder
			.replace(/[\\/]+$/, '')
			.split(/[\\/]/)
			.pop() ?? '';
	const built = buildSession(p.images, s.doc, labelFor(folderName), s.doc.display.depthCm, p.scale);
	if (!built.ok) return withPanel(s, o, {...panel, error: built.message});
	const measuring = {...s, overlay: {...o, panel: {kind: 'measuring', path: p.folder} as const, built: panel}};
	return queue(measuring, {kind: 'scanner-measure-built', folder: p.folder, session: built.session});
}
