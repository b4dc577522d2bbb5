/** 8-bit PNG (grey or RGB) with fast-png, carrying the illustration label as a tEXt chunk. */
import {encode} from 'fast-png';

export interface PixelImage {
	readonly width: number;
	readonly height: number;
	/** 1 = grey, 3 = RGB (interleaved). */
	readonly channels: 1 | 3;
	readonly data: Uint8Array;
}

/** PNG bytes; `text` becomes tEXt chunks (keywords as PNG defines, e.g. Description). */
export function encodePng(image: PixelImage, text: Record<string, string> = {}): Uint8Array {
	return encode({width: image.width, height: image.height, data: image.data, depth: 8, channels: image.channels, text});
}
