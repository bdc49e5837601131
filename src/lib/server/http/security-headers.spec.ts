import { describe, expect, it } from 'vitest';
import {
	applySecurityHeaders,
	HSTS,
	PERMISSIONS_POLICY,
	withImageSources
} from './security-headers';

const PUBLIC_PAGE = { https: false, private: false, imageSources: [] };

describe('withImageSources', () => {
	it('adds sources to img-src once, leaving other directives alone', () => {
		const policy = "default-src 'self'; img-src 'self' data:; script-src 'self' 'nonce-abc'";
		expect(withImageSources(policy, ['http://127.0.0.1:2595', 'data:'])).toBe(
			"default-src 'self'; img-src 'self' data: http://127.0.0.1:2595; script-src 'self' 'nonce-abc'"
		);
	});

	it('gives a policy without img-src one', () => {
		expect(withImageSources("default-src 'self';", ['https://*.tiles.test'])).toBe(
			"default-src 'self'; img-src https://*.tiles.test"
		);
	});
});

describe('applySecurityHeaders', () => {
	const page = () =>
		new Headers({
			'content-type': 'text/html',
			'content-security-policy': "default-src 'self'; img-src 'self'"
		});

	it('sets nosniff, framing, referrer and permissions on every answer', () => {
		const headers = page();
		applySecurityHeaders(headers, PUBLIC_PAGE);
		expect(headers.get('x-content-type-options')).toBe('nosniff');
		expect(headers.get('x-frame-options')).toBe('DENY');
		expect(headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
		expect(headers.get('permissions-policy')).toBe(PERMISSIONS_POLICY);
		expect(headers.get('strict-transport-security')).toBeNull();
		expect(headers.get('cache-control')).toBeNull();
	});

	it('adds HSTS over https only', () => {
		const headers = page();
		applySecurityHeaders(headers, { ...PUBLIC_PAGE, https: true });
		expect(headers.get('strict-transport-security')).toBe(HSTS);
	});

	it('makes private pages, data and redirects no-store, but keeps a private media lifetime', () => {
		for (const type of ['text/html; charset=utf-8', 'application/json']) {
			const headers = new Headers({ 'content-type': type, 'cache-control': 'public, max-age=60' });
			applySecurityHeaders(headers, { ...PUBLIC_PAGE, private: true });
			expect(headers.get('cache-control')).toBe('private, no-store');
		}
		const redirect = new Headers({ location: '/owner' });
		applySecurityHeaders(redirect, { ...PUBLIC_PAGE, private: true });
		expect(redirect.get('cache-control')).toBe('private, no-store');
		const photo = new Headers({
			'content-type': 'image/jpeg',
			'cache-control': 'private, max-age=300'
		});
		applySecurityHeaders(photo, { ...PUBLIC_PAGE, private: true });
		expect(photo.get('cache-control')).toBe('private, max-age=300');
	});

	it('allows the tile origin for images on pages only', () => {
		const headers = page();
		applySecurityHeaders(headers, { ...PUBLIC_PAGE, imageSources: ['http://127.0.0.1:2595'] });
		expect(headers.get('content-security-policy')).toBe(
			"default-src 'self'; img-src 'self' http://127.0.0.1:2595"
		);
		const media = new Headers({
			'content-type': 'application/pdf',
			'content-security-policy': "default-src 'none'; sandbox"
		});
		applySecurityHeaders(media, { ...PUBLIC_PAGE, imageSources: ['http://127.0.0.1:2595'] });
		expect(media.get('content-security-policy')).toBe("default-src 'none'; sandbox");
	});

	it('lets forms lead to the payment provider’s hosted pages, on pages only', () => {
		const headers = new Headers({
			'content-type': 'text/html',
			'content-security-policy': "default-src 'self'; form-action 'self'"
		});
		applySecurityHeaders(headers, {
			...PUBLIC_PAGE,
			formActions: ['https://checkout.stripe.com', 'https://connect.stripe.com']
		});
		expect(headers.get('content-security-policy')).toBe(
			"default-src 'self'; form-action 'self' https://checkout.stripe.com https://connect.stripe.com"
		);
	});
});
