/** Installers' documents: recording uploads, listing them, and who may fetch one. */
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import {
	canViewInstallerDocument,
	isProfilePublic,
	mayRemoveDocument,
	stageOf,
	type DocumentKind,
	type DocumentViewer
} from '$lib/people/vetting';
import { db, type Tx } from '../db';
import { installerDocument, installerProfile } from '../db/schema';
import { discardUpload, type StoredUpload } from '../files/uploads';
import { refuse, type Refusal } from '../refusal';

export async function documentKinds(
	tx: Tx | typeof db,
	installerId: string
): Promise<DocumentKind[]> {
	const rows = await tx
		.selectDistinct({ kind: installerDocument.kind })
		.from(installerDocument)
		.where(eq(installerDocument.installerId, installerId));
	return rows.map((r) => r.kind);
}

/** Records an uploaded document against the installer; null when there is no profile yet. */
export async function addInstallerDocument(
	installerId: string,
	kind: DocumentKind,
	stored: StoredUpload
): Promise<string | null> {
	const [exists] = await db
		.select({ id: installerProfile.userId })
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	if (!exists) return null;
	const [row] = await db
		.insert(installerDocument)
		.values({
			installerId,
			kind,
			objectKey: stored.objectKey,
			thumbKey: stored.thumbKey,
			contentType: stored.contentType,
			bytes: stored.bytes,
			originalName: stored.originalName
		})
		.returning({ id: installerDocument.id });
	return row?.id ?? null;
}

/** An installer's documents, newest first (never the storage keys). */
export async function listInstallerDocuments(installerId: string, kinds?: DocumentKind[]) {
	return db
		.select({
			id: installerDocument.id,
			kind: installerDocument.kind,
			contentType: installerDocument.contentType,
			originalName: installerDocument.originalName,
			bytes: installerDocument.bytes,
			hasThumb: sql<boolean>`${installerDocument.thumbKey} is not null`,
			createdAt: installerDocument.createdAt
		})
		.from(installerDocument)
		.where(
			and(
				eq(installerDocument.installerId, installerId),
				kinds ? inArray(installerDocument.kind, kinds) : undefined
			)
		)
		.orderBy(desc(installerDocument.createdAt));
}

/**
 * A document the viewer may fetch, or why not: 'not-found', 'sign-in' (anonymous) or 'forbidden'.
 * Unknown ids answer 'not-found' only to those who could see a document at all, so ids cannot be
 * probed anonymously.
 */
export async function findViewableDocument(viewer: DocumentViewer | null, id: string) {
	const [doc] = await db
		.select({
			id: installerDocument.id,
			installerId: installerDocument.installerId,
			kind: installerDocument.kind,
			objectKey: installerDocument.objectKey,
			thumbKey: installerDocument.thumbKey,
			contentType: installerDocument.contentType,
			originalName: installerDocument.originalName,
			vettingStatus: installerProfile.vettingStatus
		})
		.from(installerDocument)
		.leftJoin(installerProfile, eq(installerProfile.userId, installerDocument.installerId))
		.where(eq(installerDocument.id, id));
	if (!doc) return viewer ? ('not-found' as const) : ('sign-in' as const);
	const profilePublic = isProfilePublic(doc.vettingStatus);
	const decision = canViewInstallerDocument(viewer, { ...doc, profilePublic });
	return decision === 'allowed' ? doc : decision;
}

/**
 * Removes one of the installer's own documents (its row, then its stored files). Gallery photos
 * may go at any time; vetting documents only while the application is not sent or an admin has
 * asked for more.
 * @returns the removed document's original name, or a refusal
 */
export async function removeInstallerDocument(
	installerId: string,
	documentId: string
): Promise<{ ok: true; originalName: string } | Refusal> {
	const removed = await db.transaction(async (tx) => {
		const [profile] = await tx
			.select({
				vettingStatus: installerProfile.vettingStatus,
				submittedAt: installerProfile.submittedAt
			})
			.from(installerProfile)
			.where(eq(installerProfile.userId, installerId))
			.for('update');
		const [doc] = await tx
			.select({
				kind: installerDocument.kind,
				objectKey: installerDocument.objectKey,
				thumbKey: installerDocument.thumbKey,
				originalName: installerDocument.originalName
			})
			.from(installerDocument)
			.where(
				and(eq(installerDocument.id, documentId), eq(installerDocument.installerId, installerId))
			);
		if (!profile || !doc) return refuse(404, 'There is no such document among yours.');
		if (!mayRemoveDocument(doc.kind, stageOf(profile))) {
			return refuse(
				409,
				'This document is part of an application an admin has read. Upload a newer one instead, or ask the admin team to remove it.'
			);
		}
		await tx.delete(installerDocument).where(eq(installerDocument.id, documentId));
		return doc;
	});
	if ('ok' in removed) return removed;
	// After commit: a file left behind by a failed delete is only unreferenced storage.
	await discardUpload(removed);
	return { ok: true, originalName: removed.originalName };
}
