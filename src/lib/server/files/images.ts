/**
 * Re-encodes uploaded photos with sharp: turned upright from their EXIF orientation, scaled down,
 * written as fresh JPEGs. sharp copies no metadata unless asked, so EXIF (camera, GPS position,
 * time) never reaches storage.
 */
import sharp from 'sharp';

/** Longest side of a stored photo and of its thumbnail, in pixels. */
export const PHOTO_MAX_PX = 2000;
export const THUMB_PX = 320;

export interface PreparedImage {
	main: Buffer;
	thumb: Buffer;
	width: number;
	height: number;
}

/** Re-encodes a photo and makes its thumbnail; throws when sharp cannot read it. */
export async function prepareImage(input: Uint8Array): Promise<PreparedImage> {
	// limitInputPixels guards against decompression bombs (a small file that expands enormously).
	const base = sharp(input, { limitInputPixels: 60_000_000, failOn: 'error' }).rotate();
	const main = await base
		.clone()
		.resize({ width: PHOTO_MAX_PX, height: PHOTO_MAX_PX, fit: 'inside', withoutEnlargement: true })
		.jpeg({ quality: 82 })
		.toBuffer({ resolveWithObject: true });
	const thumb = await base
		.clone()
		.resize({ width: THUMB_PX, height: THUMB_PX, fit: 'cover' })
		.jpeg({ quality: 75 })
		.toBuffer();
	return { main: main.data, thumb, width: main.info.width, height: main.info.height };
}
