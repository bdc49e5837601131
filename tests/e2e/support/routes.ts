/**
 * The app's routes as read from src/routes, for suites that must cover every route that exists now
 * and every route added later: pages with a server load, form actions (`default` or `?/name`) and
 * endpoints with HTTP method handlers. Nothing here is listed by hand; the source text is parsed.
 */
import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';

export const ROUTES_DIR = path.resolve('src/routes');

/** One path segment parameter, e.g. `[id=uuid]` → { name: 'id', matcher: 'uuid' }. */
export interface RouteParam {
	name: string;
	matcher?: string;
}

export interface RouteTarget {
	kind: 'page' | 'action' | 'endpoint';
	/** The route's file, relative to src/routes. */
	file: string;
	/** The URL with route groups dropped and parameters kept, e.g. `/owner/jobs/[id=uuid]/vehicle`. */
	pattern: string;
	params: RouteParam[];
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	/** For actions: `default` or the named action. */
	action?: string;
	/**
	 * Whether the handler reads the request (its body or query). An action that does not acts on
	 * its path alone, so any body at all may carry it out.
	 */
	readsRequest: boolean;
	/** The first route group, e.g. `owner` for `(owner)/owner/...`; undefined outside a group. */
	group?: string;
}

const HTTP_METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

function walk(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
		const full = path.join(dir, entry.name);
		return entry.isDirectory() ? walk(full) : [full];
	});
}

/** The folder path as a URL pattern: route groups dropped, `[param]` segments kept. */
export function routePattern(relativeDir: string): { pattern: string; params: RouteParam[] } {
	const segments = relativeDir
		.split(path.sep)
		.filter((s) => s !== '' && s !== '.' && !/^\(.*\)$/.test(s));
	const params: RouteParam[] = [];
	for (const segment of segments) {
		for (const m of segment.matchAll(/\[(?:\.\.\.)?([A-Za-z_]\w*)(?:=(\w+))?\]/g)) {
			params.push({ name: m[1]!, matcher: m[2] });
		}
	}
	return { pattern: '/' + segments.join('/'), params };
}

/**
 * The top-level keys of `export const actions = { ... }` with the source text of each value, found
 * by counting brackets (strings and comments are skipped well enough for this code base).
 */
export function parseActions(source: string): Array<{ name: string; body: string }> {
	const start = source.search(/export\s+const\s+actions\s*(?::[^=]+)?=\s*\{/);
	if (start < 0) return [];
	const open = source.indexOf('{', source.indexOf('=', start));
	const found: Array<{ name: string; body: string }> = [];
	let depth = 0;
	let current: { name: string; from: number } | undefined;
	let i = open;
	const finish = (to: number) => {
		if (current) found.push({ name: current.name, body: source.slice(current.from, to) });
		current = undefined;
	};
	for (; i < source.length; i++) {
		const c = source[i]!;
		if (c === '/' && source[i + 1] === '/') {
			i = source.indexOf('\n', i);
			if (i < 0) break;
			continue;
		}
		if (c === '/' && source[i + 1] === '*') {
			i = source.indexOf('*/', i) + 1;
			continue;
		}
		if (c === "'" || c === '"' || c === '`') {
			let j = i + 1;
			while (j < source.length && source[j] !== c) j += source[j] === '\\' ? 2 : 1;
			i = j;
			continue;
		}
		if (c === '{' || c === '(' || c === '[') {
			depth++;
			continue;
		}
		if (c === '}' || c === ')' || c === ']') {
			depth--;
			if (depth === 0) {
				finish(i);
				break;
			}
			continue;
		}
		if (depth === 1) {
			if (c === ',') {
				finish(i);
				continue;
			}
			if (!current && /[A-Za-z_$]/.test(c)) {
				const m = /^(?:async\s+)?([A-Za-z_$][\w$]*)/.exec(source.slice(i));
				if (m) {
					current = { name: m[1]!, from: i };
					i += m[0].length - 1;
				}
			}
		}
	}
	return found;
}

/** The exported HTTP method handlers of a `+server.ts` source. */
export function parseMethods(
	source: string
): Array<{ method: RouteTarget['method']; body: string }> {
	return HTTP_METHODS.flatMap((method) => {
		const m = new RegExp(
			`export\\s+(?:const\\s+${method}\\b[^=]*=|(?:async\\s+)?function\\s+${method}\\b)`
		).exec(source);
		if (!m) return [];
		return [{ method, body: source.slice(m.index, m.index + 400) }];
	});
}

/** Every page load, form action and endpoint under src/routes, sorted by pattern. */
export function routeTargets(root = ROUTES_DIR): RouteTarget[] {
	const targets: RouteTarget[] = [];
	for (const file of walk(root)) {
		const base = path.basename(file);
		if (base !== '+page.server.ts' && base !== '+server.ts') continue;
		const relative = path.relative(root, file);
		const dir = path.dirname(relative);
		const { pattern, params } = routePattern(dir);
		const group = /^\(([^)]+)\)/.exec(dir)?.[1];
		const source = readFileSync(file, 'utf8');
		const common = { file: relative, pattern, params, group };
		if (base === '+server.ts') {
			for (const { method, body } of parseMethods(source)) {
				targets.push({
					...common,
					kind: 'endpoint',
					method,
					readsRequest: /\b(request|url)\b/.test(body.split('=>')[0] ?? '')
				});
			}
			continue;
		}
		if (/export\s+(const|async\s+function|function)\s+load\b/.test(source)) {
			targets.push({ ...common, kind: 'page', method: 'GET', readsRequest: true });
		}
		for (const { name, body } of parseActions(source)) {
			targets.push({
				...common,
				kind: 'action',
				method: 'POST',
				action: name,
				// The handler's own parameters: `async ({ request, params })`.
				readsRequest: /\brequest\b/.test(/\(([^)]*)\)/.exec(body)?.[1] ?? '')
			});
		}
	}
	return targets.sort((a, b) =>
		`${a.pattern} ${a.kind} ${a.action ?? a.method}`.localeCompare(
			`${b.pattern} ${b.kind} ${b.action ?? b.method}`
		)
	);
}

/** A readable name for a target, e.g. `POST /owner/jobs/[id=uuid]/vehicle ?/default`. */
export function targetName(t: RouteTarget): string {
	return `${t.method} ${t.pattern}${t.kind === 'action' ? ` ?/${t.action}` : ''}${t.kind === 'page' ? ' (page)' : ''}`;
}

/** Fills a pattern's parameters with already URL-ready values (in order of `params`). */
export function fillPattern(pattern: string, values: Record<string, string>): string {
	return pattern.replace(
		/\[(?:\.\.\.)?([A-Za-z_]\w*)(?:=\w+)?\]/g,
		(_, name: string) => values[name] ?? ''
	);
}

/**
 * The form field names a route's own pages and components use (`name="x"` or `field="x"` in the
 * .svelte files of its folder), so generated bodies carry real field names as well as odd ones.
 */
export function fieldNames(target: RouteTarget, root = ROUTES_DIR): string[] {
	const dir = path.join(root, path.dirname(target.file));
	const names = new Set<string>();
	for (const entry of readdirSync(dir, { withFileTypes: true })) {
		if (!entry.isFile() || !entry.name.endsWith('.svelte')) continue;
		const text = readFileSync(path.join(dir, entry.name), 'utf8');
		for (const m of text.matchAll(/\b(?:name|field)="([A-Za-z_][\w.[\]]*)"/g)) names.add(m[1]!);
	}
	return [...names].sort();
}
