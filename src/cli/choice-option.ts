/** An option that takes one word from a fixed list; anything else is refused naming the list. */
import {UsageError} from '../errors/usage-error.js';

export function choiceOption<T extends string>(option: string, text: string, choices: readonly T[]): T {
	if (!(choices as readonly string[]).includes(text))
		throw new UsageError(`--${option}: must be one of ${choices.join(', ')} (got "${text}")`);
	return text as T;
}
