/**
 * The install record as a PDF (pdf-lib, standard Helvetica): the same facts as the printable page,
 * with the report's photos, A4, for the owner to keep for service and warranty.
 */
import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from 'pdf-lib';
import { describeFitReport } from '$lib/forms/fit-report';
import { stageWords } from '$lib/work/lifecycle';
import { formatInZone } from '$lib/time';
import { getObject } from '../files/storage';
import type { InstallRecord } from './fit-reports';

// A4 in PDF points (ISO 216: 210 × 297 mm at 72 points an inch).
const PAGE: [number, number] = [595.28, 841.89];
const MARGIN = 48;
const WIDTH = PAGE[0] - 2 * MARGIN;
/** A record is read years later, so its days always carry the year. */
export const RECORD_DAY = 'EEE d MMM yyyy';

/** Text the standard fonts can draw: anything outside their character set becomes '?'. */
function drawable(font: PDFFont, text: string): string {
	const known = new Set(font.getCharacterSet());
	return [...text.replace(/\s+/g, ' ')]
		.map((ch) => (known.has(ch.codePointAt(0)!) ? ch : '?'))
		.join('');
}

function wrap(font: PDFFont, text: string, size: number, width: number): string[] {
	const lines: string[] = [];
	let line = '';
	for (const word of text.split(' ')) {
		const next = line ? `${line} ${word}` : word;
		if (line && font.widthOfTextAtSize(next, size) > width) {
			lines.push(line);
			line = word;
		} else line = next;
	}
	if (line) lines.push(line);
	return lines;
}

async function readBytes(key: string): Promise<Uint8Array | null> {
	const object = await getObject(key);
	return object ? new Uint8Array(await new Response(object.body).arrayBuffer()) : null;
}

/** Builds the install record PDF of a booking with a filed report. */
export async function installRecordPdf(
	record: InstallRecord,
	now = new Date()
): Promise<Uint8Array> {
	const doc = await PDFDocument.create();
	doc.setTitle(`Install record: ${record.title}`);
	doc.setAuthor('Tapline');
	doc.setCreationDate(now);
	const regular = await doc.embedFont(StandardFonts.Helvetica);
	const bold = await doc.embedFont(StandardFonts.HelveticaBold);
	let page: PDFPage = doc.addPage(PAGE);
	let y = PAGE[1] - MARGIN;

	const room = (needed: number) => {
		if (y - needed < MARGIN) {
			page = doc.addPage(PAGE);
			y = PAGE[1] - MARGIN;
		}
	};
	const text = (value: string, size = 10, font = regular, indent = 0) => {
		for (const line of wrap(font, drawable(font, value), size, WIDTH - indent)) {
			room(size + 4);
			page.drawText(line, { x: MARGIN + indent, y: y - size, size, font, color: rgb(0, 0, 0) });
			y -= size + 4;
		}
	};
	const gap = (points = 8) => {
		y -= points;
	};
	const row = (label: string, value: string) => {
		text(label, 9, bold);
		text(value, 10, regular, 10);
		gap(3);
	};

	text('Install record', 20, bold);
	text(record.title, 12);
	gap();
	row('Vehicle', record.vehicle);
	row('Owner', record.ownerName);
	row('Installer', record.businessName);
	row('Booked fit', formatInZone(record.slotStart, record.timeZone, RECORD_DAY));
	row('Stage', stageWords(record.stage));
	const report = record.report;
	if (report) {
		row(
			'Fit report filed',
			`${formatInZone(report.filedAt, record.timeZone, RECORD_DAY)} (visit ${String(report.visit)}, ${String(report.minutesTaken)} minutes on the vehicle)`
		);
	}
	gap();
	text('Parts', 13, bold);
	if (record.parts.length === 0) text('No parts listed.');
	for (const part of record.parts)
		text(`${String(part.quantity)} × ${part.label}`, 10, regular, 10);
	gap();
	text('Circuits and checks', 13, bold);
	if (!report) text('No fit report has been filed yet.');
	else {
		for (const r of describeFitReport(report.details)) row(r.label, r.value);
		if (report.notes) row('Installer notes', report.notes);
	}
	if (report && report.photos.length > 0) {
		gap();
		text('Photos', 13, bold);
		const cell = (WIDTH - 12) / 2;
		let column = 0;
		let rowHeight = 0;
		for (const photo of report.photos) {
			const bytes = await readBytes(photo.objectKey);
			if (!bytes) continue;
			const image = await doc.embedJpg(bytes);
			const scale = Math.min(cell / image.width, 220 / image.height);
			const w = image.width * scale;
			const h = image.height * scale;
			if (column === 0) room(h + 8);
			page.drawImage(image, { x: MARGIN + column * (cell + 12), y: y - h, width: w, height: h });
			rowHeight = Math.max(rowHeight, h);
			column = (column + 1) % 2;
			if (column === 0) {
				y -= rowHeight + 12;
				rowHeight = 0;
			}
		}
		if (column === 1) y -= rowHeight + 12;
	}
	gap();
	text(
		"Keep this record with the vehicle for service and warranty. Anyone working on the wiring later should check it against the vehicle maker's manual and follow licensed practice and local rules.",
		8
	);
	return doc.save();
}
