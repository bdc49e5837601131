/**
 * The demo installers' vetting documents as real files in the object store, so an admin who opens
 * one sees a document, not a missing file. Both are generated here and say plainly that they are
 * invented for the demo: a one-page PDF certificate (pdf-lib) and a JPEG card (sharp from SVG).
 * Uploaded through the S3 API with the same settings the app uses (S3_ENDPOINT and friends).
 */
import {
	CreateBucketCommand,
	HeadBucketCommand,
	PutObjectCommand,
	S3Client
} from '@aws-sdk/client-s3';
import { PDFDocument, StandardFonts, rgb } from 'pdf-lib';
import sharp from 'sharp';

/** One file to store under its key. */
export interface DemoObject {
	objectKey: string;
	contentType: string;
	body: Uint8Array;
}

/** The two demo files every vetted demo installer holds, generated once per seed. */
export async function demoDocumentFiles(): Promise<{ insurance: Uint8Array; photoId: Uint8Array }> {
	const pdf = await PDFDocument.create();
	pdf.setTitle('Demo certificate of currency (invented)');
	const page = pdf.addPage([595, 842]);
	const font = await pdf.embedFont(StandardFonts.Helvetica);
	const bold = await pdf.embedFont(StandardFonts.HelveticaBold);
	const lines: Array<[string, number, boolean]> = [
		['Certificate of currency: public liability', 22, true],
		['DEMO DOCUMENT, invented for the Tapline demo. Not a real policy.', 12, true],
		['Insured: the demo installer named on the Tapline application', 12, false],
		['Cover: public and products liability, $20,000,000 any one occurrence', 12, false],
		['Period: twelve months from the date of the application', 12, false],
		['Insurer: an invented underwriter (demo data)', 12, false]
	];
	let y = 760;
	for (const [text, size, isBold] of lines) {
		page.drawText(text, {
			x: 56,
			y,
			size,
			font: isBold ? bold : font,
			color: rgb(0.1, 0.12, 0.15)
		});
		y -= size + 18;
	}
	const insurance = await pdf.save();
	const card = `<svg xmlns="http://www.w3.org/2000/svg" width="640" height="400">
	<rect width="640" height="400" rx="24" fill="#e7ecef"/>
	<rect x="40" y="90" width="170" height="220" rx="12" fill="#b9c3ca"/>
	<circle cx="125" cy="170" r="44" fill="#8d9aa4"/>
	<rect x="70" y="230" width="110" height="60" rx="30" fill="#8d9aa4"/>
	<text x="240" y="130" font-family="DejaVu Sans, sans-serif" font-size="30" font-weight="bold" fill="#1b1f24">DEMO PHOTO ID</text>
	<text x="240" y="180" font-family="DejaVu Sans, sans-serif" font-size="20" fill="#1b1f24">Invented for the Tapline demo</text>
	<text x="240" y="215" font-family="DejaVu Sans, sans-serif" font-size="20" fill="#1b1f24">Not an identity document</text>
</svg>`;
	const photoId = await sharp(Buffer.from(card)).jpeg({ quality: 80 }).toBuffer();
	return { insurance, photoId: new Uint8Array(photoId) };
}

/**
 * Stores the demo files through the S3 API the app uses; creates the bucket when missing.
 * @returns how many objects were stored, or null when no object store is configured
 */
export async function storeDemoObjects(objects: DemoObject[]): Promise<number | null> {
	const endpoint = process.env.S3_ENDPOINT;
	if (!endpoint) return null;
	const bucket = process.env.S3_BUCKET ?? 'tapline-uploads';
	const s3 = new S3Client({
		region: process.env.S3_REGION ?? 'ap-southeast-2',
		endpoint,
		forcePathStyle: true,
		credentials: {
			accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'local',
			secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'local-secret'
		}
	});
	try {
		try {
			await s3.send(new HeadBucketCommand({ Bucket: bucket }));
		} catch {
			await s3.send(new CreateBucketCommand({ Bucket: bucket }));
		}
		for (const o of objects) {
			await s3.send(
				new PutObjectCommand({
					Bucket: bucket,
					Key: o.objectKey,
					Body: o.body,
					ContentType: o.contentType
				})
			);
		}
		return objects.length;
	} finally {
		s3.destroy();
	}
}
