/** RGB copies of grey pictures: the tissue stays grey (R = G = B); burned-in graphics are coloured,
 * as on many scanners, so a reader must mask non-grey pixels rather than trust every channel. */

/** Amber, an invented choice for burned-in text. */
const overlayColour = [240, 190, 40] as const;

export function greyToRgb(grey: Uint8Array, overlay: Uint8Array | null): Uint8Array {
	const rgb = new Uint8Array(grey.length * 3);
	for (let i = 0; i < grey.length; i++) {
		const coloured = overlay !== null && overlay[i] === 1;
		rgb[3 * i] = coloured ? overlayColour[0] : grey[i]!;
		rgb[3 * i + 1] = coloured ? overlayColour[1] : grey[i]!;
		rgb[3 * i + 2] = coloured ? overlayColour[2] : grey[i]!;
	}
	return rgb;
}

export const colourOverlayNote = `RGB images: tissue grey (R = G = B); burned-in text and scale in rgb(${overlayColour.join(', ')})`;
