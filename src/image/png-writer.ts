/** 8-bit PNG (grey or RGB) with fast-png, carrying the illustration label as a tEXt chunk. */
import {encode} from 'fast-png';

export interface PixelImage {
	readonly width: number;
	readonly height: number;
	/** 1 = grey, 3 = RGB (interleaved). */
	readonly channels: 1 | 3;
	readonly data: Uint8Array;
}

/** tEXt holds Latin-1 only: dashes become '-', anything else outside it '?'. */
function latin1(text: string): string {
	return text.replace(/[\u2012-\u2015]/g, '-').replace(/[^\x20-\x7e\xa0-\xff]/g, '?');
}

/** PNG bytes; `text` becomes tEXt chunks (keywords as PNG defines, e.g. Description). */
export function encodePng(image: PixelImage, text: Record<string, string> = {}): Uint8Array {
	const chunks = Object.fromEntries(Object.entries(text).map(([k, v]) => [k, latin1(v)]));
	return encode({
		width: image.width,
		height: image.height,
		data: image.data,
		depth: 8,
		channels: image.channels,
		text: chunks,
	});
}
