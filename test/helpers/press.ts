/**
 * Keystroke helpers for ink-testing-library: write a key, then wait for a condition, never a
 * guessed delay. Ink renders through a legacy React root, so a key's update, its render and the
 * effects it queues run in microtasks and event-loop turns right after the write, not on a timer:
 * `settle` waits for those turns until no new frame comes, however slow the machine is; a
 * condition is polled with vitest's own `vi.waitFor`.
 */
import type {render} from 'ink-testing-library';
import {vi} from 'vitest';

export type Rendered = ReturnType<typeof render>;

const tick = () => new Promise<void>((resolve) => setImmediate(resolve));

/** The last frame, never undefined. */
export function frame(app: Rendered): string {
	return app.lastFrame() ?? '';
}

/**
 * Waits until the app has rendered and listens to stdin (Ink subscribes in an effect after the
 * first frame; a key written before is lost).
 */
export async function ready(app: Rendered): Promise<void> {
	await waitUntil(
		() => app.lastFrame() !== undefined && app.stdin.listenerCount('readable') > 0,
		'the first frame and the input listener',
		5000,
	);
}

/** Waits until written keys have been handled: event-loop turns until two pass with no new frame. */
export async function settle(app: Rendered): Promise<void> {
	let quiet = 0;
	let seen = app.frames.length;
	for (let turns = 0; quiet < 2; turns++) {
		if (turns > 10_000) throw new Error('the console kept rendering and never settled');
		await tick();
		quiet = app.frames.length === seen ? quiet + 1 : 0;
		seen = app.frames.length;
	}
}

/** Waits until `test` holds (checked every few ms, up to `timeoutMs`), then lets the turns it queued run. */
async function waitUntil(test: () => boolean, what: string, timeoutMs: number): Promise<void> {
	await vi.waitFor(
		() => {
			if (!test()) throw new Error(`timed out waiting for ${what}`);
		},
		{timeout: timeoutMs, interval: 2},
	);
	await tick();
	await tick();
}

/** Presses each key in turn, waiting for the frame to change after each. */
export async function press(app: Rendered, ...sequence: string[]): Promise<void> {
	for (const key of sequence) {
		const before = frame(app);
		app.stdin.write(key);
		await waitUntil(() => frame(app) !== before, `the frame to change after ${JSON.stringify(key)}`, 3000);
		await settle(app);
	}
}

/** Types text one character at a time (a character may leave the frame as it was, so no waiting for a change). */
export async function type(app: Rendered, text: string): Promise<void> {
	for (const ch of text) await send(app, ch);
}

/** For a key that may leave the frame as it is: write it and wait until the console has settled. */
export async function send(app: Rendered, key: string): Promise<void> {
	app.stdin.write(key);
	await settle(app);
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

/**
 * Presses `key` until a row marked `> ` anywhere on a line (a list beside a plot, say) contains
 * `text`.
 */
export async function moveToMarked(app: Rendered, key: string, text: string, limit = 40): Promise<void> {
	for (let i = 0; i < limit; i++) {
		if (frame(app).includes(`> ${text}`)) return;
		await press(app, key);
	}
	throw new Error(`no row marked "> ${text}" came under the cursor; frame:\n${frame(app)}`);
}

/** The first line whose first non-blank character is the cursor mark `>`. */
export function selectedLine(app: Rendered): string {
	return (
		frame(app)
			.split('\n')
			.find((l) => /^\s*> /.test(l)) ?? ''
	);
}
