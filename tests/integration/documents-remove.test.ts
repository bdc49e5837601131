import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { installerDocument } from '$lib/server/db/schema';
import { removeInstallerDocument } from '$lib/server/people/documents';
import { addDocument, makeApplicant, makeCompleteDraft } from './vetting-helpers';

const rowExists = async (id: string) =>
	(await db.select().from(installerDocument).where(eq(installerDocument.id, id))).length === 1;

describe('removeInstallerDocument', () => {
	it('removes a document of an application not yet sent', async () => {
		const installer = await makeCompleteDraft();
		const id = await addDocument(installer.id, 'qualification');
		expect(await removeInstallerDocument(installer.id, id)).toEqual({
			ok: true,
			originalName: 'qualification.pdf'
		});
		expect(await rowExists(id)).toBe(false);
	});

	it("refuses another installer's document as unknown, and keeps it", async () => {
		const owner = await makeCompleteDraft();
		const other = await makeCompleteDraft();
		const id = await addDocument(owner.id, 'qualification');
		const result = await removeInstallerDocument(other.id, id);
		expect(result).toMatchObject({ ok: false, status: 404 });
		expect(await rowExists(id)).toBe(true);
	});

	it('keeps the vetting documents of a sent application, but not its gallery', async () => {
		const installer = await makeApplicant();
		const certificate = await addDocument(installer.id, 'insurance');
		const result = await removeInstallerDocument(installer.id, certificate);
		expect(result).toMatchObject({ ok: false, status: 409 });
		expect(await rowExists(certificate)).toBe(true);
		const gallery = await addDocument(installer.id, 'gallery');
		expect(await removeInstallerDocument(installer.id, gallery)).toMatchObject({ ok: true });
		expect(await rowExists(gallery)).toBe(false);
	});
});
