/**
 * Keystroke helpers for ink-testing-library: write a key, then wait until the frame changes
 * (not a guessed delay), and once more so effects settle.
 */
import type {render} from 'ink-testing-library';

export type Rendered = ReturnType<typeof render>;

const tick = () => new Promise<void>((resolve) => setImmediate(resolve));
const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/** The last frame, never undefined. */
export function frame(app: Rendered): string {
	return app.lastFrame() ?? '';
}

/** Waits until the app has rendered and subscribed to input (effects run after the first frame). */
export async function ready(app: Rendered): Promise<void> {
	const start = Date.now();
	while (!app.lastFrame() && Date.now() - start < 2000) await sleep(5);
	// Ink subscribes to stdin in an effect after the first frame; a key written before is lost.
	await sleep(100);
}

async function waitUntil(test: () => boolean, what: string, timeoutMs: number): Promise<void> {
	const start = Date.now();
	while (!test()) {
		if (Date.now() - start > timeoutMs) throw new Error(`timed out waiting for ${what}`);
		await sleep(2);
	}
	await tick();
	await tick();
}

/** Presses each key in turn, waiting for the frame to change after each. */
export async function press(app: Rendered, ...sequence: string[]): Promise<void> {
	for (const key of sequence) {
		const before = frame(app);
		app.stdin.write(key);
		await waitUntil(() => frame(app) !== before, `the frame to change after ${JSON.stringify(key)}`, 3000);
	}
}

/** Types text one character at a time (a character may leave the frame as it was, so no waiting for a change). */
export async function type(app: Rendered, text: string): Promise<void> {
	for (const ch of text) await send(app, ch);
}

/** For a key that may leave the frame as it is: write it and give Ink a moment. */
export async function send(app: Rendered, key: string): Promise<void> {
	app.stdin.write(key);
	await sleep(30);
}

/** Waits until the frame contains `text`. */
export async function waitForText(app: Rendered, text: string, timeoutMs = 3000): Promise<void> {
	await waitUntil(() => frame(app).includes(text), JSON.stringify(text), timeoutMs);
}

/** Presses `key` until the frame's selected row (the line starting with `>`) contains `text`. */
export async function moveTo(app: Rendered, key: string, text: string, limit = 40): Promise<void> {
	for (let i = 0; i < limit; i++) {
		if (selectedLine(app).includes(text)) return;
		await press(app, key);
	}
	throw new Error(`no row with ${JSON.stringify(text)} came under the cursor; frame:\n${frame(app)}`);
}

/** The first line whose first non-blank character is the cursor mark `>`. */
export function selectedLine(app: Rendered): string {
	return (
		frame(app)
			.split('\n')
			.find((l) => /^\s*> /.test(l)) ?? ''
	);
}
