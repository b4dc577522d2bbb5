/**
 * Why an image cannot be used. The message names the attribute (DICOM tag and name, or the PNG or
 * session field) and what would be accepted; the CLI turns it into exit code 2.
 */
export class ImageRefusal extends Error {
	constructor(
		/** The attribute or field at fault, e.g. `(0018,6011) Sequence of Ultrasound Regions`. */
		readonly field: string,
		problem: string,
	) {
		super(`${field}: ${problem}`);
		this.name = 'ImageRefusal';
	}
}

/** Hard limits checked before anything is decoded. */
export const imageLimits = {
	/** Largest image file read, bytes (64 MB). */
	maxFileBytes: 64 * 1024 * 1024,
	/** Largest width or height accepted, pixels. */
	maxSidePx: 8192,
} as const;
