/**
 * Errors the preset store throws when the user asked for something it cannot do. They extend
 * UsageError, so the CLI prints them as one message with exit code 2 and any caller (console,
 * table command) can tell them apart with `instanceof`.
 */
import {UsageError} from '../errors/usage-error.js';

/** Base class: the request was refused and nothing stored changed. */
export class PresetStoreError extends UsageError {
	constructor(message: string, details: readonly string[] = []) {
		super(message, details);
		this.name = 'PresetStoreError';
	}
}

/** A user preset already holds this name; pass `overwrite` (CLI: `--force`) to replace it. */
export class PresetExistsError extends PresetStoreError {
	constructor(
		readonly existingId: string,
		readonly existingName: string,
		message = `a user preset named "${existingName}" already exists (${existingId}); use --force to replace it`,
		details: readonly string[] = [],
	) {
		super(message, details);
		this.name = 'PresetExistsError';
	}
}

/** No template or user preset answers to this id or name. */
export class PresetNotFoundError extends PresetStoreError {
	constructor(readonly query: string) {
		super(`no preset with the id or name "${query}" (evenecho presets list shows them all)`);
		this.name = 'PresetNotFoundError';
	}
}

/** Templates ship with the program and are never changed by it. */
export class TemplateReadOnlyError extends PresetStoreError {
	constructor(
		readonly templateId: string,
		action: string,
	) {
		super(
			`"${templateId}" is a built-in template and cannot be ${action}; "evenecho presets copy ${templateId} <name>" makes your own copy`,
		);
		this.name = 'TemplateReadOnlyError';
	}
}

/** A preset name outside the safe character set or length. */
export class PresetNameError extends PresetStoreError {
	constructor(message: string) {
		super(message);
		this.name = 'PresetNameError';
	}
}

/** A file to import (or a plan to save) failed a check; `details` lists each problem. */
export class PresetImportError extends PresetStoreError {
	constructor(message: string, details: readonly string[] = []) {
		super(message, details);
		this.name = 'PresetImportError';
	}
}

/** A stored user preset that no longer validates; it is kept as it is and reported. */
export class PresetInvalidError extends PresetStoreError {
	constructor(
		readonly presetId: string,
		readonly file: string,
		problems: readonly string[],
	) {
		super(
			`user preset ${presetId} (${file}) no longer validates; fix the file or delete it with "evenecho presets delete ${presetId}"`,
			problems,
		);
		this.name = 'PresetInvalidError';
	}
}
