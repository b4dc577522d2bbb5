/**
 * The console's state as plain data: which step, which row, what is being typed, which question
 * is open, and the plan itself. No React or Ink here.
 */
import type {PlanDocument} from '../../plan/plan-schema.js';
import type {ScannerEffect, ScannerOverlay} from './scanner-state.js';
import type {StartingPoint} from './starting-point.js';
import {closedSweep, type SweepState} from './sweep-state.js';
import {closedRefine, type RefinePanel} from './refine-state.js';

export const stepIds = ['start', 'stack', 'probe', 'usual', 'curve'] as const;
export type StepId = (typeof stepIds)[number];

/** Titles are ours; the short form is for the step bar at 80 columns. */
export const stepTitles: Record<StepId, {readonly title: string; readonly short: string}> = {
	start: {title: 'Starting plan', short: 'Start'},
	stack: {title: 'Tissue stack', short: 'Stack'},
	probe: {title: 'Probe & system', short: 'Probe'},
	usual: {title: 'Usual gains', short: 'Usual'},
	curve: {title: 'Curve & save', short: 'Curve'},
};

/** The fat sweep to export instead of the plan: the thickness list and whether rows are deltas. */
export interface SweepExport {
	readonly fatCm: readonly number[];
	readonly isDelta: boolean;
}

/** What a yes answer goes on to do. */
export type FollowUp =
	| {readonly kind: 'quit'}
	| {readonly kind: 'load'; readonly pointId: string}
	| {readonly kind: 'overwrite'; readonly name: string}
	| {readonly kind: 'replace-export'; readonly dir: string; readonly sweep?: SweepExport};

export type Overlay =
	| {readonly kind: 'help'}
	| {readonly kind: 'warnings'}
	/**
	 * This patient beside another plan (key v): the starting plan (index -1), or the starting point
	 * at `index` of the list (a template or a saved preset), once loaded.
	 */
	| {
			readonly kind: 'compare';
			readonly index: number;
			readonly against?: {readonly name: string; readonly plan: PlanDocument};
	  }
	| {readonly kind: 'ask'; readonly question: string; readonly then: FollowUp}
	| {readonly kind: 'name'; readonly text: string; readonly isFresh: boolean; readonly error?: string}
	/** The folder to export the plan (or the fat sweep) into, typed (the current one offered). */
	| {readonly kind: 'path'; readonly text: string; readonly isFresh: boolean; readonly sweep?: SweepExport}
	| {readonly kind: 'tissue'; readonly layer: number; readonly cursor: number; readonly filter?: string}
	| ScannerOverlay;

/** Side effects asked for by the reducer and carried out by the app (then reported back). */
export type Effect =
	| {readonly kind: 'exit'}
	| {readonly kind: 'load'; readonly pointId: string}
	| {readonly kind: 'load-compare'; readonly pointId: string; readonly index: number}
	| {readonly kind: 'save'; readonly name: string; readonly overwrite: boolean}
	| {readonly kind: 'export'; readonly dir: string; readonly replace: boolean; readonly sweep?: SweepExport}
	| {readonly kind: 'refine'; readonly path: string; readonly frame?: number; readonly settings?: string}
	| ScannerEffect;

export interface Editing {
	/** The row being edited (row ids are stable while the plan's shape is). */
	readonly rowId: string;
	readonly text: string;
	/** True until the first key: typing then replaces the shown text instead of appending (Backspace edits it). */
	readonly isFresh: boolean;
}

export interface Notice {
	readonly text: string;
	readonly tone: 'done' | 'warning' | 'info';
	/** Shown whole (wrapped over the key-hint line, and more if needed) until the next key: a written path. */
	readonly isWhole?: boolean;
}

/** What stands where the curve plot is: the plot, or the simulated picture (both panels when
 * wide; on a narrow screen this plan's or the ramp's alone), or, narrow, the slider bank (wide
 * shows it beside the slider table already). */
export type PictureChoice = 'off' | 'plan' | 'ramp' | 'bank';

/** The next choice for the picture key: wide off → both → off; narrow off → plan → ramp → bank → off. */
export function nextPicture(p: PictureChoice, isWide: boolean): PictureChoice {
	if (p === 'off' || (isWide && p === 'bank')) return 'plan';
	if (isWide) return 'off';
	return p === 'plan' ? 'ramp' : p === 'ramp' ? 'bank' : 'off';
}

export interface ConsoleState {
	readonly doc: PlanDocument;
	/** The starting point the plan came from: its layers are the "standard" for usual gains. */
	readonly origin: {readonly name: string; readonly layers: PlanDocument['layers']; readonly doc: PlanDocument};
	readonly step: StepId;
	readonly cursors: Readonly<Record<StepId, number>>;
	/** Which pane has the keys when both are shown (100 columns and wider). */
	readonly pane: 'step' | 'curve';
	/** Narrow layout: where Tab goes back to after showing the curve. */
	readonly returnStep: StepId | null;
	readonly isWide: boolean;
	/** The picture in place of the curve plot (key p). */
	readonly picture: PictureChoice;
	/** Terminal size, for views that scroll (the fat sweep's columns and pages). */
	readonly columns: number;
	readonly rows: number;
	/** Tissue stack: the layer whose details are open, or null for the stack itself. */
	readonly openLayer: number | null;
	readonly editing: Editing | null;
	/** A refusal shown beside a field until the next edit or move. */
	readonly refusal: {readonly rowId: string; readonly message: string} | null;
	readonly overlay: Overlay | null;
	readonly dirty: boolean;
	readonly notice: Notice | null;
	readonly startingPoints: readonly StartingPoint[];
	readonly storeProblems: readonly string[];
	readonly effects: readonly Effect[];
	/** The folder offered when exporting: the last one exported to, first the current one. */
	readonly exportFolder: string;
	/** Last preset name saved or loaded, offered again when saving. */
	readonly presetName: string | null;
	/** The fat-thickness sweep table of step 5 (kept while closed, so its list and deltas stay). */
	readonly sweep: SweepState;
	/** Refine from an image (step 5, key i). */
	readonly refine: RefinePanel;
	/** Plans before (past, oldest first) and after (future, next first) the current one, for undo and redo. */
	readonly history: PlanHistory;
}

export interface PlanHistory {
	readonly past: readonly PlanDocument[];
	readonly future: readonly PlanDocument[];
}

/** How many plan edits undo reaches back. */
export const historyLimit = 200;

export interface InitialOptions {
	readonly doc: PlanDocument;
	readonly originName: string;
	readonly startingPoints: readonly StartingPoint[];
	readonly storeProblems?: readonly string[];
	readonly notices?: readonly string[];
	readonly isWide: boolean;
	/** Terminal size. @default 100x30 when wide, else 80x24 */
	readonly columns?: number;
	readonly rows?: number;
	/** Folder first offered for exports. @default "." */
	readonly exportFolder?: string;
}

export function createInitialState(o: InitialOptions): ConsoleState {
	return {
		doc: o.doc,
		origin: {name: o.originName, layers: structuredClone(o.doc.layers), doc: o.doc},
		step: 'start',
		cursors: {start: 0, stack: 0, probe: 0, usual: 0, curve: 0},
		pane: 'step',
		returnStep: null,
		isWide: o.isWide,
		picture: 'off',
		columns: o.columns ?? (o.isWide ? 100 : 80),
		rows: o.rows ?? (o.isWide ? 30 : 24),
		openLayer: null,
		editing: null,
		refusal: null,
		overlay: null,
		dirty: false,
		notice: o.notices?.length ? {text: o.notices.join(' '), tone: 'info'} : null,
		startingPoints: o.startingPoints,
		storeProblems: o.storeProblems ?? [],
		effects: [],
		presetName: null,
		exportFolder: o.exportFolder ?? '.',
		sweep: closedSweep,
		refine: closedRefine,
		history: {past: [], future: []},
	};
}
