/** `evenecho table …` (placeholder until protocol tables land). */
import type {Command} from 'commander';

export function registerTableCommand(_program: Command): void {}
