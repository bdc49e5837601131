/**
 * Checks an uploaded PDF before it is stored: it must parse as a PDF with at least one page
 * (pdf-lib), must not be encrypted (its objects could not be inspected) and must carry no active
 * content: scripts, automatic actions, launched programs, attached files or embedded media.
 * Such a file is refused with a reason a person can act on, not rewritten: a certificate is
 * evidence, and what the admin reads must be what the installer sent.
 */
import {
	PDFArray,
	PDFDict,
	PDFDocument,
	PDFName,
	PDFRef,
	PDFStream,
	type PDFObject
} from 'pdf-lib';

/**
 * Dictionary keys that carry or start active content wherever they appear (ISO 32000-1: 12.6.3
 * trigger events `/AA`, 12.6.4.16 JavaScript actions `/JS` and the `/JavaScript` name tree, 7.11.4
 * embedded files `/EF` and `/EmbeddedFiles`, 12.7.8 XFA forms; `/RichMedia*` from the Adobe
 * supplement to ISO 32000). `/OpenAction` itself may be a harmless "open at page 1"; the action it
 * points to is checked like any other.
 */
const ACTIVE_KEYS = [
	'AA',
	'JS',
	'JavaScript',
	'EF',
	'EmbeddedFile',
	'EmbeddedFiles',
	'XFA',
	'RichMedia',
	'RichMediaContent',
	'RichMediaSettings'
];

/**
 * Action types (`/S`) that run code, open other files or programs, or send data (ISO 32000-1,
 * 12.6.4, table 198). Links to a page (GoTo) or a web address (URI) are allowed.
 */
const ACTIVE_ACTIONS = [
	'JavaScript',
	'Launch',
	'GoToR',
	'GoToE',
	'SubmitForm',
	'ImportData',
	'Rendition',
	'Movie',
	'Sound',
	'RichMediaExecute'
];

/** Annotation and object types that embed files, media or 3D content (which can script). */
const ACTIVE_TYPES = [
	'EmbeddedFile',
	'FileAttachment',
	'RichMedia',
	'Screen',
	'Movie',
	'Sound',
	'3D'
];

const names = (list: string[]) => new Set(list.map((n) => PDFName.of(n)));
const activeKeys = names(ACTIVE_KEYS);
const activeActions = names(ACTIVE_ACTIONS);
const activeTypes = names(ACTIVE_TYPES);
const S = PDFName.of('S');
const TYPE = PDFName.of('Type');
const SUBTYPE = PDFName.of('Subtype');

/** What is wrong with a PDF, in words for the person who sent it. */
export const PDF_PROBLEMS = {
	unreadable: 'We could not read that PDF. Is the file complete? Try saving it again as a PDF.',
	encrypted:
		'That PDF is password-protected or encrypted, so we cannot check it. Upload an unprotected copy (print it to a new PDF).',
	active:
		'That PDF contains scripts, automatic actions or attached files, which we do not accept. Print it to a new PDF and upload that.'
} as const;

/** Whether a dictionary (direct or a stream's) starts or holds active content. */
function isActive(dict: PDFDict): boolean {
	for (const [key, value] of dict.entries()) {
		if (activeKeys.has(key)) return true;
		if ((key === S || key === TYPE || key === SUBTYPE) && value instanceof PDFName) {
			if (key === S && activeActions.has(value)) return true;
			if (key !== S && activeTypes.has(value)) return true;
		}
	}
	return false;
}

/** Walks an object and the direct objects inside it (indirect ones are walked on their own). */
function holdsActiveContent(object: PDFObject | undefined, depth = 0): boolean {
	if (!object || object instanceof PDFRef || depth > 64) return false;
	if (object instanceof PDFStream) return holdsActiveContent(object.dict, depth + 1);
	if (object instanceof PDFDict) {
		if (isActive(object)) return true;
		return object.values().some((value) => holdsActiveContent(value, depth + 1));
	}
	if (object instanceof PDFArray) {
		return object.asArray().some((value) => holdsActiveContent(value, depth + 1));
	}
	return false;
}

/**
 * Parses the PDF and looks at every object in it (object streams included, as pdf-lib unpacks
 * them). Returns null when the file is acceptable, else one of {@link PDF_PROBLEMS}.
 */
export async function pdfProblem(bytes: Uint8Array): Promise<string | null> {
	let doc: PDFDocument;
	try {
		doc = await PDFDocument.load(bytes, {
			ignoreEncryption: true, // so an encrypted file is told apart from a broken one, below
			updateMetadata: false,
			throwOnInvalidObject: true
		});
	} catch {
		return PDF_PROBLEMS.unreadable;
	}
	if (doc.isEncrypted) return PDF_PROBLEMS.encrypted;
	try {
		// A file that only starts with "%PDF-" (an HTML page, say) has no page tree.
		if (doc.getPageCount() < 1) return PDF_PROBLEMS.unreadable;
	} catch {
		return PDF_PROBLEMS.unreadable;
	}
	const { context } = doc;
	if (holdsActiveContent(context.trailerInfo.Root) || holdsActiveContent(context.trailerInfo.Info))
		return PDF_PROBLEMS.active;
	for (const [, object] of context.enumerateIndirectObjects()) {
		if (holdsActiveContent(object)) return PDF_PROBLEMS.active;
	}
	return null;
}
