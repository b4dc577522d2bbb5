/**
 * V8's young generation held at 2 × 8 MB in the long-running parts of the program (the console,
 * the protocol table's main thread). Their garbage is many short-lived objects (frame strings, row
 * arithmetic), for which V8 by default grows the young generation to 2 × 16 MB, all of it resident.
 * Its maximum can only be set when the process starts (`--max-semi-space-size` given later changes
 * nothing, as measured), but the growth factor is read whenever V8 grows the space: 1 (no growth)
 * once the cap is reached, the default 2 below it (V8 shrinks the space after a quiet spell and may
 * grow it back). The flag is the process's, so this state is too.
 */
import {getHeapSpaceStatistics, setFlagsFromString} from 'node:v8';

/**
 * Both semi-spaces, bytes. Measured: the console at 2 × 8 MB used 100–106 MB after 200 edits against
 * 140–160 MB, 2 × 1 MB made a key press a third dearer; a 20,000-row table peaked at 140 MB against
 * 155 MB at the same speed.
 */
const youngGenerationCapBytes = 16 * 1024 * 1024;

let isHeld: boolean | undefined;

function growthFactor(held: boolean): void {
	setFlagsFromString(`--semi-space-growth-factor=${held ? 1 : 2}`);
	isHeld = held;
}

/** No growth from now until the next check: before loading many modules, whose garbage is brief. */
export function stopYoungGenerationGrowth(): void {
	growthFactor(true);
}

/**
 * Lets the young generation grow up to the cap and no further. Call between bursts of work (after a
 * frame, after a batch of rows): the space grows only while work allocates, and nothing polls.
 */
export function holdYoungGeneration(): void {
	const young = getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')?.space_size ?? 0;
	const shouldHold = young >= youngGenerationCapBytes;
	if (shouldHold !== isHeld) growthFactor(shouldHold);
}
