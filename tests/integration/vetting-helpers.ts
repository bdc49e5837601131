// Shared set-up for the vetting integration tests: accounts and complete applications, written
// through the same server functions the pages use.
import { db } from '$lib/server/db';
import { user, type Role } from '$lib/server/db/schema';
import { addInstallerDocument } from '$lib/server/people/documents';
import {
	saveApplication,
	saveInsuranceDetails,
	submitApplication
} from '$lib/server/people/installers';
import { saveWeeklyHours } from '$lib/server/work/diary';
import type { DocumentKind } from '$lib/people/vetting';

let n = 0;

/** A fresh account of the given role; returns its id and address. */
export async function makeAccount(role: Role, label = role) {
	const id = crypto.randomUUID();
	const email = `${label}${++n}.${Date.now()}@example.test`;
	await db.insert(user).values({
		id,
		email,
		passwordHash: 'not-used-in-these-tests',
		role,
		displayName: `${label} ${n}`,
		emailVerifiedAt: new Date()
	});
	return { id, email };
}

// 51 824 753 556 is the ABN commonly quoted as a valid example (from memory; it passes the
// Australian Business Register check).
export const VALID_ABN = '51824753556';

export const NORWOOD = {
	suburb: 'Norwood',
	postcode: '5067',
	latitude: -34.9213,
	longitude: 138.6304
};

/** Stores a document row as if uploaded (the object itself is not needed for these tests). */
export async function addDocument(installerId: string, kind: DocumentKind) {
	const id = await addInstallerDocument(installerId, kind, {
		objectKey: `installers/${installerId}/${crypto.randomUUID()}.pdf`,
		thumbKey: null,
		contentType: 'application/pdf',
		bytes: 1234,
		width: null,
		height: null,
		originalName: `${kind}.pdf`
	});
	if (!id) throw new Error('document not stored');
	return id;
}

/** An installer with a complete application, saved but not sent. */
export async function makeCompleteDraft(insuranceExpiresOn = '2030-06-30') {
	const installer = await makeAccount('installer');
	const saved = await saveApplication(
		installer.id,
		{
			businessName: `Test Fitting ${installer.id.slice(0, 6)}`,
			contactName: 'Robin Test',
			phone: '0412345678',
			abn: VALID_ABN,
			gstRegistered: true,
			yearsInTrade: 6,
			skills: ['parking-mode', 'tailgate-rear'],
			offersMobile: true,
			offersWorkshop: false,
			workshopAddress: null
		},
		NORWOOD
	);
	if (!saved.ok) throw new Error(`application not saved: ${saved.message}`);
	const insurance = await saveInsuranceDetails(installer.id, {
		insurer: 'Gumleaf Mutual',
		policyNumber: 'PL-123456',
		coverCents: 20_000_000_00,
		expiresOn: insuranceExpiresOn
	});
	if (!insurance.ok) throw new Error(insurance.message);
	await addDocument(installer.id, 'insurance');
	await addDocument(installer.id, 'photo-id');
	await saveWeeklyHours(installer.id, [{ weekday: 1, start: '08:00', end: '17:00' }]);
	return installer;
}

/** An installer whose complete application is in the queue ('applied'). */
export async function makeApplicant(insuranceExpiresOn?: string) {
	const installer = await makeCompleteDraft(insuranceExpiresOn);
	const sent = await submitApplication(installer.id);
	if (!sent.ok) throw new Error(sent.message);
	return installer;
}

export const ALL_TICKED = {
	identityMatches: true,
	insuranceCurrent: true,
	abnValidAndActive: true
};
export const NONE_TICKED = {
	identityMatches: false,
	insuranceCurrent: false,
	abnValidAndActive: false
};
