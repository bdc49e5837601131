/** Installers' documents: recording uploads, listing them, and who may fetch one. */
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import {
	canViewInstallerDocument,
	isProfilePublic,
	type DocumentKind,
	type DocumentViewer
} from '$lib/vetting';
import { db, type Tx } from './db';
import { installerDocument, installerProfile } from './db/schema';
import type { StoredUpload } from './files/uploads';

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
