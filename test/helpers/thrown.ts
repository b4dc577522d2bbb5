/** The error of one kind that `work` throws; anything else thrown passes through, and no throw fails the test. */
export function thrown<E extends Error>(kind: abstract new (...args: never[]) => E, work: () => unknown): E {
	try {
		work();
	} catch (error) {
		if (error instanceof kind) return error;
		throw error;
	}
	throw new Error(`expected a ${kind.name}, but nothing was thrown`);
}
