/**
 * PDFs for the upload tests, built with pdf-lib: a clean one-page certificate and the hostile
 * variants the upload check must refuse (ISO 32000-1 names: 12.6.4.16 JavaScript actions, 12.6.3
 * additional actions, 12.6.4.5 Launch, 7.11.4 embedded files, 7.6 encryption).
 */
import { PDFDocument, PDFName, PDFString, StandardFonts } from 'pdf-lib';

async function certificate(
	change?: (doc: PDFDocument) => void | Promise<void>,
	objectStreams = true
) {
	const doc = await PDFDocument.create();
	const page = doc.addPage([420, 300]);
	const font = await doc.embedFont(StandardFonts.Helvetica);
	page.drawText('Certificate of currency: public liability', { x: 30, y: 250, size: 14, font });
	page.drawText('Gumleaf Mutual, policy PL-778899', { x: 30, y: 220, size: 11, font });
	await change?.(doc);
	return Buffer.from(await doc.save({ useObjectStreams: objectStreams }));
}

const javaScriptAction = (doc: PDFDocument) =>
	doc.context.obj({ Type: 'Action', S: 'JavaScript', JS: PDFString.of('app.alert("hi")') });

/** A clean one-page PDF, as an insurer's portal would send. */
export const cleanPdf = () => certificate();

/** Hostile PDFs, each with the active content the upload check must find, by name. */
export async function hostilePdfs(): Promise<Record<string, Buffer>> {
	return {
		'JavaScript run on opening (OpenAction)': await certificate((doc) =>
			doc.catalog.set(PDFName.of('OpenAction'), doc.context.register(javaScriptAction(doc)))
		),
		'document-level JavaScript (Names tree)': await certificate((doc) => {
			const scripts = doc.context.obj({ Names: [PDFString.of('hello'), javaScriptAction(doc)] });
			doc.catalog.set(PDFName.of('Names'), doc.context.obj({ JavaScript: scripts }));
		}),
		'page-open additional action (AA)': await certificate((doc) =>
			doc.getPage(0).node.set(PDFName.of('AA'), doc.context.obj({ O: javaScriptAction(doc) }))
		),
		'Launch action': await certificate((doc) =>
			doc.catalog.set(
				PDFName.of('OpenAction'),
				doc.context.obj({ S: 'Launch', F: PDFString.of('calc.exe') })
			)
		),
		'embedded file': await certificate(async (doc) => {
			await doc.attach(Buffer.from('MZ not really a program'), 'setup.exe', {
				mimeType: 'application/octet-stream'
			});
		}),
		// The same JavaScript action with its /JS key spelled with a hex escape (/J#53), in a file
		// written without object streams so the escape sits in the bytes as written.
		'JavaScript behind an escaped name': Buffer.from(
			(
				await certificate(
					(doc) =>
						doc.catalog.set(PDFName.of('OpenAction'), doc.context.register(javaScriptAction(doc))),
					false
				)
			)
				.toString('latin1')
				.replace('/JS ', '/J#53 '),
			'latin1'
		)
	};
}

/** An encrypted PDF (a trailer /Encrypt entry): its objects cannot be inspected, so it is refused. */
export const encryptedPdf = () =>
	certificate((doc) => {
		doc.context.trailerInfo.Encrypt = doc.context.register(
			doc.context.obj({ Filter: 'Standard', V: 1, R: 2 })
		);
	}, false);

/** An HTML page that starts with the PDF signature, so a sniff of the first bytes says "PDF". */
export const htmlWithPdfSignature = () =>
	Buffer.from('%PDF-1.7\n<html><body><script>alert(document.cookie)</script></body></html>\n');
