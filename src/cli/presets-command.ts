/** `evenecho presets …` (placeholder until the preset store lands). */
import type {Command} from 'commander';

export function registerPresetsCommand(_program: Command): void {}
