/**
 * Where the maps' tiles come from: PUBLIC_TILE_URL (a Leaflet URL template), else the local tiles
 * fake. Shared by the map components and the Content-Security-Policy, which allows images from
 * this origin (hooks.server.ts), so pointing the maps elsewhere needs no second setting.
 */
export const DEFAULT_TILE_URL = 'http://127.0.0.1:2595/{z}/{x}/{y}.png';

/** The tile URL template in force. */
export const tileUrl = (configured: string | undefined) => configured || DEFAULT_TILE_URL;

/**
 * The CSP source that tiles are fetched from (scheme, host and port), with `*.` for a `{s}`
 * subdomain template; null when the template is not an absolute URL.
 */
export function tileSource(configured: string | undefined): string | null {
	try {
		const template = tileUrl(configured).replace('{s}', 'tile-subdomain');
		const url = new URL(template.replace(/\{[^}]*\}/g, '0'));
		return `${url.protocol}//${url.host.replace(/^tile-subdomain\./, '*.')}`;
	} catch {
		return null;
	}
}
