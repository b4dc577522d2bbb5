/**
 * `evenecho` with no arguments. In a terminal it opens the planning console (Ink, loaded only
 * here so the batch commands never pay for it). Piped or in CI it never touches raw mode: it
 * prints the demo plan's summary and says how to open the console.
 */
import {computeCurve} from '../engine/compensation-curve.js';
import {demoPlan} from '../plan/demo-plan.js';
import {resolvePlan} from '../plan/resolve-plan.js';
import {curveSummary} from '../report/curve-summary.js';

/** CI set to anything but an explicit no. */
function isCi(env: NodeJS.ProcessEnv): boolean {
	const ci = env['CI'];
	return ci !== undefined && ci !== '' && ci !== '0' && ci.toLowerCase() !== 'false';
}

export function canOpenConsole(
	stdin: {isTTY?: boolean} = process.stdin,
	stdout: {isTTY?: boolean} = process.stdout,
	env = process.env,
): boolean {
	return Boolean(stdin.isTTY) && Boolean(stdout.isTTY) && !isCi(env);
}

export const howToOpen =
	'This is the built-in demo plan. To plan a patient, run `evenecho` in a terminal (no pipe, CI unset) to open the ' +
	'console; `evenecho curve PLAN.json` works without one.';

// Alternate screen: the console gets the whole terminal and the shell's scrollback comes back intact.
const enterScreen = '\u001B[?1049h\u001B[H';
const leaveScreen = '\u001B[?1049l';

export async function openConsole(): Promise<void> {
	if (!canOpenConsole()) {
		process.stdout.write(curveSummary(computeCurve(resolvePlan(demoPlan()))));
		process.stdout.write(`\n${howToOpen}\n`);
		return;
	}
	// Tuned before Ink and React load (see render-options.ts).
	const {consoleRenderOptions, tuneProcessForConsole} = await import('./render-options.js');
	tuneProcessForConsole();
	const [{render}, {createElement}, {App}, {openShelf}, {themeFromEnv}, {openScannerServices}] = await Promise.all([
		import('ink'),
		import('react'),
		import('./app.js'),
		import('./effects/preset-shelf.js'),
		import('./kit/theme.js'),
		import('./effects/scanner-services.js'),
	]);
	const shelf = openShelf();
	let isDirty = false;
	process.stdout.write(enterScreen);
	try {
		const instance = render(
			createElement(App, {
				shelf,
				scanners: openScannerServices(),
				theme: themeFromEnv(),
				onExit: (s: {readonly isDirty: boolean}) => {
					isDirty = s.isDirty;
				},
			}),
			consoleRenderOptions,
		);
		const stop = () => instance.unmount();
		process.once('SIGTERM', stop);
		process.once('SIGHUP', stop);
		await instance.waitUntilExit();
		process.off('SIGTERM', stop);
		process.off('SIGHUP', stop);
	} finally {
		process.stdout.write(leaveScreen);
	}
	process.stdout.write(
		isDirty ? 'evenecho: closed; the last changes were not saved as a preset.\n' : 'evenecho: closed.\n',
	);
}
