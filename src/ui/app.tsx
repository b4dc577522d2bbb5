/**
 * The planning console: step bar, the current step (with the live curve beside it from 100
 * columns), the status and hint lines, and the caution on every screen.
 */
import {Box, Text, useApp, useInput} from 'ink';
import {useEffect, useMemo, useReducer, useRef} from 'react';
import {scannerResponseOf} from '../calibration/profile-document.js';
import {
	computeCurve,
	curvePhysics,
	type CurvePhysics,
	fitCurve,
	reusablePhysics,
} from '../engine/compensation-curve.js';
import type {CurveResult} from '../engine/types.js';
import {demoPlan} from '../plan/demo-plan.js';
import type {PlanDocument} from '../plan/plan-schema.js';
import {planWithNote} from '../plan/plan-note.js';
import {resolvePlan, type PlanScanner} from '../plan/resolve-plan.js';
import {CautionLine} from './frame/caution-line.js';
import {consoleReducer, modeOf, type Action} from './state/console-reducer.js';
import {runEffect} from './effects/console-effects.js';
import {createInitialState} from './state/console-state.js';
import {deltaOf, liveLine} from './state/curve-facts.js';
import {CompareView} from './plot/compare-view.js';
import {CurvePane} from './plot/curve-pane.js';
import {CurveStep} from './steps/curve-step.js';
import {HelpOverlay} from './frame/help-overlay.js';
import {HintLine} from './frame/hint-line.js';
import {splitKeys} from './state/key-intents.js';
import {layoutFor, type Layout} from './kit/layout.js';
import type {PresetShelf} from './effects/preset-shelf.js';
import {noScannerServices, type ScannerServices} from './effects/scanner-services.js';
import {ScannerView} from './scanner/scanner-view.js';
import {demoPoint} from './state/starting-point.js';
import {StatusLine, statusLines} from './frame/status-line.js';
import {StepBar} from './frame/step-bar.js';
import {StepPane} from './steps/step-pane.js';
import {SweepView} from './sweep/sweep-view.js';
import {RefineView} from './refine/refine-view.js';
import {clip} from './kit/text-fit.js';
import {colourTheme, type Theme} from './kit/theme.js';
import {ThemeContext} from './kit/theme-context.js';
import {TissuePicker} from './steps/tissue-picker.js';
import {useTerminalSize} from './kit/use-terminal-size.js';
import {warningLines} from './plot/warning-lines.js';
import {WarningsView} from './plot/warnings-view.js';
import type {ConsoleState} from './state/console-state.js';

export interface AppProps {
	readonly shelf: PresetShelf;
	/** The plan to open with. @default the built-in demo */
	readonly initialPlan?: PlanDocument;
	readonly theme?: Theme;
	/** Fixed terminal size (tests, the bench); otherwise read from stdout and kept up to date. */
	readonly columns?: number;
	readonly rows?: number;
	/** Where exports are written. @default the current directory */
	readonly exportDir?: string;
	/** Scanner profiles (key g): the store and the image reader. @default none */
	readonly scanners?: ScannerServices;
	/** Called once when the console closes, with whether the plan had unsaved changes. */
	readonly onExit?: (summary: {readonly isDirty: boolean}) => void;
}

/**
 * The plan's curve. `kept` holds the physics of the last curve worked out (samples, band, noise
 * floor): an edit of the slider bank or master gain alone reuses them and redoes only the fit.
 */
function curveOf(
	doc: PlanDocument,
	scanner: PlanScanner | undefined,
	kept?: {current: CurvePhysics | undefined},
): CurveResult | string {
	try {
		const plan = resolvePlan(doc, scanner);
		if (!kept) return computeCurve(plan);
		const physics = reusablePhysics(kept.current, plan) ?? curvePhysics(plan);
		kept.current = physics;
		return fitCurve(physics, plan);
	} catch (error) {
		// The schema should make this unreachable; still never crash the console over it.
		return `The curve could not be worked out: ${error instanceof Error ? error.message : String(error)}`;
	}
}

function Body({
	state,
	curve,
	layout,
	scanner,
}: {
	readonly state: ConsoleState;
	readonly curve: CurveResult;
	readonly layout: Layout;
	/** The measured scanner this plan names, if any: a compared plan naming the same one is drawn on it too. */
	readonly scanner: PlanScanner | undefined;
}) {
	const o = state.overlay;
	const {columns, bodyRows} = layout;
	const delta = deltaOf(curve, state.doc);
	if (o?.kind === 'help') return <HelpOverlay width={columns} height={bodyRows} />;
	if (o?.kind === 'warnings') return <WarningsView curve={curve} width={columns} height={bodyRows} />;
	if (o?.kind === 'compare') {
		const point = o.index < 0 ? undefined : state.startingPoints[o.index];
		const against = o.index < 0 ? {name: state.origin.name, plan: state.origin.doc} : o.against;
		const title =
			o.index < 0
				? 'Starting plan'
				: point?.kind === 'preset'
					? 'Saved preset'
					: point?.kind === 'demo'
						? 'Built-in demo'
						: 'Template';
		const other = against
			? curveOf(against.plan, against.plan.scanner === state.doc.scanner ? scanner : undefined)
			: 'Reading that plan…';
		return (
			<CompareView
				curve={curve}
				other={other}
				thisName={state.doc.name}
				otherName={against?.name ?? point?.name ?? ''}
				otherTitle={title}
				width={columns}
				height={bodyRows}
			/>
		);
	}
	if (o?.kind === 'tissue')
		return <TissuePicker layer={o.layer} cursor={o.cursor} filter={o.filter ?? ''} width={columns} height={bodyRows} />;
	if (o?.kind === 'scanner')
		return <ScannerView overlay={o} plan={state.doc} chosen={state.doc.scanner} width={columns} height={bodyRows} />;
	if (state.refine.phase !== 'closed') return <RefineView panel={state.refine} width={columns} height={bodyRows} />;
	if (state.sweep.isOpen) return <SweepView state={state} width={columns} height={bodyRows} />;
	const slider = Math.min(state.cursors.curve, curve.fit.sliders.length - 1);
	if (layout.isWide) {
		const isCurveStep = state.step === 'curve';
		return (
			<Box flexDirection="row">
				{isCurveStep ? (
					<CurveStep
						state={state}
						curve={curve}
						delta={delta}
						layout={layout}
						width={layout.stepWidth}
						height={bodyRows}
					/>
				) : (
					<StepPane
						state={state}
						curve={curve}
						delta={delta}
						width={layout.stepWidth}
						height={bodyRows}
						isFocused={state.pane === 'step'}
					/>
				)}
				<Box width={1} />
				<CurvePane
					curve={curve}
					delta={delta}
					width={layout.curveWidth}
					// Warning lines the pane does not need this time go to the plot or picture.
					plotRows={isCurveStep ? bodyRows - 3 : layout.plotRows + 3 - warningLines(curve, 3).length}
					isFocused={state.pane === 'curve' && !isCurveStep}
					slider={isCurveStep && state.cursors.curve >= curve.fit.sliders.length ? -1 : slider}
					isPlotOnly={isCurveStep}
					picture={state.picture}
				/>
			</Box>
		);
	}
	if (state.step === 'curve')
		return <CurveStep state={state} curve={curve} delta={delta} layout={layout} width={columns} height={bodyRows} />;
	return (
		<Box flexDirection="column">
			<Box height={bodyRows - 1}>
				<StepPane state={state} curve={curve} delta={delta} width={columns} height={bodyRows - 1} isFocused />
			</Box>
			<Text wrap="truncate">{clip(liveLine(curve, delta, columns), columns)}</Text>
		</Box>
	);
}

export function App({
	shelf,
	initialPlan,
	theme = colourTheme,
	columns,
	rows,
	exportDir,
	scanners = noScannerServices,
	onExit,
}: AppProps) {
	const size = useTerminalSize({...(columns === undefined ? {} : {columns}), ...(rows === undefined ? {} : {rows})});
	const layout = layoutFor(size.columns, size.rows);
	const [state, dispatch] = useReducer(consoleReducer, undefined, () => {
		const listed = shelf.list();
		return createInitialState({
			doc: initialPlan ?? demoPlan(),
			originName: initialPlan ? initialPlan.name : demoPoint.name,
			startingPoints: listed.points,
			storeProblems: listed.problems,
			notices: shelf.notices,
			isWide: layout.isWide,
			columns: layout.columns,
			rows: layout.rows,
			exportFolder: exportDir ?? process.cwd(),
		});
	});
	const {exit} = useApp();
	// Reported on unmount, however the console closes (q, Ctrl+C, a signal).
	const dirtyRef = useRef(state.dirty);
	dirtyRef.current = state.dirty;
	useEffect(() => () => onExit?.({isDirty: dirtyRef.current}), [onExit]);

	useEffect(() => {
		dispatch({type: 'resize', isWide: layout.isWide, columns: layout.columns, rows: layout.rows});
	}, [layout.isWide, layout.columns, layout.rows]);

	useInput((input, key) => {
		for (const press of splitKeys(input, key)) dispatch({type: 'key', ...press});
	});

	useEffect(() => {
		if (state.effects.length === 0) return;
		const batch = state.effects;
		dispatch({type: 'effects-taken', count: batch.length});
		const ctx = {
			shelf,
			// Files get the note marked when the values left the starting plan's behind.
			doc: planWithNote(state.doc, state.origin),
			exit,
			scanners,
			// Slow work (measuring a session) starts once the frame saying so has been drawn.
			later: (work: () => Promise<Action[]>) => {
				setTimeout(() => void work().then((actions) => actions.forEach(dispatch)), 20);
			},
		};
		for (const effect of batch) for (const action of runEffect(effect, ctx)) dispatch(action);
	}, [state.effects, state.doc, state.origin, shelf, exit, scanners]);

	// The measured scanner the plan names: from the panel's fresh list while it is open (a profile
	// may just have been kept), else from the store.
	const panelProfiles = state.overlay?.kind === 'scanner' ? state.overlay.profiles : null;
	const named = useMemo(() => {
		const id = state.doc.scanner;
		if (id === undefined) return undefined;
		const listed = panelProfiles?.find((p) => p.id === id);
		return listed ? {scanner: scannerResponseOf(listed)} : scanners.lookup(id);
	}, [state.doc.scanner, scanners, panelProfiles]);
	const scannerProblem = named && 'problem' in named ? named.problem : undefined;
	useEffect(() => {
		if (scannerProblem) dispatch({type: 'failed', message: scannerProblem});
	}, [scannerProblem]);
	const planScanner = named && 'scanner' in named ? named.scanner : undefined;
	const keptPhysics = useRef<CurvePhysics | undefined>(undefined);
	const curve = useMemo(() => curveOf(state.doc, planScanner, keptPhysics), [state.doc, planScanner]);

	// A notice read whole (a written path) takes the key-hint line, then lines from the body's bottom.
	const noticeRows = statusLines(state, layout.columns).length;
	const bodyGiven = Math.max(0, noticeRows - 2);
	const hintPage =
		state.overlay?.kind === 'scanner' && state.overlay.panel.kind === 'result' ? 'scanner-result' : undefined;
	return (
		<ThemeContext.Provider value={theme}>
			<Box flexDirection="column" width={layout.columns}>
				<StepBar step={state.step} width={layout.columns} isDirty={state.dirty} />
				<Box height={layout.bodyRows - bodyGiven} flexDirection="column" overflowY="hidden">
					{typeof curve === 'string' ? (
						<Text {...theme.refusal}>{curve}</Text>
					) : (
						<Body state={state} curve={curve} layout={layout} scanner={planScanner} />
					)}
				</Box>
				<StatusLine state={state} width={layout.columns} />
				{noticeRows > 1 ? null : <HintLine mode={modeOf(state)} width={layout.columns} page={hintPage} />}
				<CautionLine width={layout.columns} />
			</Box>
		</ThemeContext.Provider>
	);
}
