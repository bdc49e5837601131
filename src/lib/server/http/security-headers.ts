/**
 * Response headers that every answer carries (hooks.server.ts), beside the Content-Security-Policy
 * that SvelteKit writes from `kit.csp` in svelte.config.js.
 */

/**
 * Browser features Tapline never uses, switched off for the page and anything it embeds. File
 * inputs still open the camera app on phones: that is not the camera permission.
 */
export const PERMISSIONS_POLICY =
	'camera=(), microphone=(), geolocation=(), payment=(), usb=(), browsing-topics=()';

/** Two years, the preload list's minimum (hstspreload.org, from memory). */
export const HSTS = 'max-age=63072000; includeSubDomains';

/** Adds sources to a policy's img-src (or gives it one), leaving every other directive alone. */
export function withImageSources(policy: string, sources: readonly string[]): string {
	return withSources(policy, 'img-src', sources);
}

/** Adds sources to one directive of a policy (or gives it one), leaving the others alone. */
export function withSources(policy: string, directive: string, sources: readonly string[]): string {
	const directives = policy
		.split(';')
		.map((d) => d.trim())
		.filter(Boolean);
	const i = directives.findIndex((d) => d.split(/\s+/)[0] === directive);
	const current = i >= 0 ? directives[i]!.split(/\s+/) : [directive];
	const merged = [...current, ...sources.filter((s) => !current.includes(s))].join(' ');
	if (i >= 0) directives[i] = merged;
	else directives.push(merged);
	return directives.join('; ');
}

export interface HeaderContext {
	/** The site is served over HTTPS (ORIGIN starts with https://). */
	https: boolean;
	/** The answer is for a signed-in person, or from the JSON API: never stored by any cache. */
	private: boolean;
	/** Extra image sources for HTML pages (the map tiles' origin). */
	imageSources: readonly string[];
	/**
	 * Where forms may lead besides this site: the payment provider's hosted pages (checkout and
	 * payouts onboarding), which a form's redirect reaches; `form-action` covers redirects.
	 */
	formActions?: readonly string[];
}

/** Sets the security headers on a response in place. */
export function applySecurityHeaders(headers: Headers, context: HeaderContext): void {
	headers.set('x-content-type-options', 'nosniff');
	headers.set('referrer-policy', 'strict-origin-when-cross-origin');
	headers.set('x-frame-options', 'DENY');
	headers.set('permissions-policy', PERMISSIONS_POLICY);
	if (context.https) headers.set('strict-transport-security', HSTS);

	const type = headers.get('content-type') ?? '';
	const isPage = type.startsWith('text/html');
	// Pages, data and redirects are no-store; a media file that chose `private, max-age` keeps it.
	if (
		context.private &&
		(isPage ||
			type.startsWith('application/json') ||
			!headers.get('cache-control')?.includes('private'))
	) {
		headers.set('cache-control', 'private, no-store');
	}

	const csp = headers.get('content-security-policy');
	if (isPage && csp) {
		let policy = csp;
		if (context.imageSources.length > 0) policy = withImageSources(policy, context.imageSources);
		if (context.formActions?.length)
			policy = withSources(policy, 'form-action', context.formActions);
		headers.set('content-security-policy', policy);
	}
}
