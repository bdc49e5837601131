// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// What `npm start` and `npm test` print while they set up: one line per step with its time, the
// chatter of installs and builds in a log file, and afterwards the warnings, sorted into the ones
// that are expected (each with the reason) and the ones worth a look.
import { appendFileSync, mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { ROOT } from './config.mjs';
import { runLogged, StopRequested } from './processes.mjs';

const tty = Boolean(process.stdout.isTTY);
const paint = (code) => (text) => (tty ? `\x1b[${code}m${text}\x1b[0m` : text);
export const bold = paint('1');
const dim = paint('2');
const green = paint('32');
const red = paint('31');
const yellow = paint('33');

// Colour codes in tools' output (ESC [ … letter), built from a string to keep the regex readable.
const ANSI = new RegExp(`${String.fromCharCode(27)}\\[[0-9;]*[A-Za-z]`, 'g');
const stripAnsi = (text) => text.replace(ANSI, '');

// Lines that look like a warning; anything matched here and by no rule below is shown.
const WARNING_LIKE =
	/\bwarn(ing)?s?\b|deprecat|\berror\b|circular dependency|empty chunk|^W: |\(!\)/i;

// A built file and its size, as Vite lists them: never a warning, whatever the file is called.
const ASSET_LINE = /^\S+\.\w+\s+[\d.,]+ (?:B|kB|MB)\b/;

const packagesIn = (line) => [
	...new Set([...line.matchAll(/node_modules\/((?:@[^/]+\/)?[^/]+)/g)].map((m) => m[1]))
];

/** Warnings every fresh start shows today, with why they are harmless. */
const EXPECTED = [
	{
		key: 'npm-install-scripts',
		test: (line) => /^npm warn install-scripts/.test(line),
		why: (lines) =>
			`npm did not run the install scripts of ${lines.filter((l) => /@\d/.test(l)).length} esbuild copies (npm 11 asks before running any). ` +
			'They only check the binary esbuild already takes from its platform package; tsx and the build work without them.'
	},
	{
		key: 'circular-dependencies',
		test: (line) =>
			/^Circular dependency: /.test(line) &&
			line
				.slice('Circular dependency: '.length)
				.split(' -> ')
				.every((p) => p.includes('node_modules/')),
		why: (lines) =>
			`${lines.length} circular imports inside dependencies (${[...new Set(lines.flatMap(packagesIn))].join(', ')}), ` +
			"reported by Rolldown while bundling. They are those packages' own structure and resolve at run time; none is in Tapline's code."
	},
	{
		key: 'empty-chunks',
		test: (line) => /^Generated an empty chunk/.test(line),
		why: (lines) =>
			`${lines.length} empty chunks in the server build: SvelteKit modules with nothing left after tree-shaking. Harmless.`
	},
	{
		key: 'plugin-timings',
		test: (line) => /\[PLUGIN_TIMINGS\]/.test(line),
		why: () =>
			"Rolldown's note that SvelteKit's own plugin, which writes the server bundle, takes most of the build time. Information only."
	},
	{
		key: 'aws-sdk-node-version',
		// Node prints its own "(Use `node --trace-warnings ...`" hint after the warning.
		test: (line) => /NodeVersionSupportWarning|^\(Use `node --trace-warnings/.test(line),
		why: () =>
			'the AWS SDK says its versions published from 2027 will need Node 22. Tapline runs on Node 20 and its locked SDK supports it.'
	}
];

/**
 * A report for one run: `step()` times and prints each step, `run()` runs a command into the log,
 * `printWarnings()` lists what the commands warned about.
 */
export function createReport(name, logFile) {
	mkdirSync(path.dirname(logFile), { recursive: true });
	writeFileSync(logFile, `${name}, ${new Date().toISOString()}\n`);
	const timings = [];
	const expected = new Map();
	const notable = [];
	const relLog = path.relative(process.cwd(), logFile) || logFile;

	const log = (text) => appendFileSync(logFile, `${text}\n`);

	function scan(output) {
		for (const raw of output.split('\n')) {
			const line = stripAnsi(raw).trim();
			if (!line) continue;
			const rule = EXPECTED.find((r) => r.test(line));
			if (rule) {
				const lines = expected.get(rule.key) ?? [];
				lines.push(line);
				expected.set(rule.key, lines);
			} else if (WARNING_LIKE.test(line) && !ASSET_LINE.test(line)) notable.push(line);
		}
	}

	const line = (mark, label, seconds, note) =>
		`  ${mark} ${label.padEnd(22)} ${dim(`${seconds.toFixed(1).padStart(5)} s`)}${note ? `  ${note}` : ''}`;

	return {
		logFile,
		relLog,
		timings,
		log,

		/**
		 * Runs `fn(step)` as one step; `step.note(text)` adds a word after the time. Prints a ✓ or
		 * ✗ line, and rethrows a failure after printing where the details are.
		 */
		async step(label, fn) {
			const started = Date.now();
			let note = '';
			log(`\n▸ ${label}`);
			if (tty) process.stdout.write(`  ${dim('…')} ${label}`);
			const clear = () => tty && process.stdout.write('\r\x1b[K');
			try {
				const result = await fn({ note: (text) => (note = text) });
				const seconds = (Date.now() - started) / 1000;
				timings.push({ label, seconds });
				clear();
				console.log(line(green('✓'), label, seconds, note));
				return result;
			} catch (err) {
				clear();
				if (err instanceof StopRequested) throw err;
				const seconds = (Date.now() - started) / 1000;
				console.log(line(red('✗'), label, seconds, note));
				log(String(err?.stack ?? err));
				throw err;
			}
		},

		/** Runs a command with its output in the log; the output is scanned for warnings. */
		async run(cmd, args, options = {}) {
			log(`$ ${path.relative(ROOT, cmd) || cmd} ${args.join(' ')}`);
			try {
				const output = await runLogged(cmd, args, { ...options, logFile });
				scan(output);
				return output;
			} catch (err) {
				if (err.output) scan(err.output);
				throw err;
			}
		},

		/** Scans output that did not come through run(), such as a child's start-up lines. */
		scan,

		/** Prints the warnings seen so far: expected ones once each with the reason, others in full. */
		printWarnings() {
			if (expected.size === 0 && notable.length === 0) return;
			console.log('');
			if (expected.size > 0) {
				console.log(`  ${dim(`Expected warnings (full text in ${relLog}):`)}`);
				for (const rule of EXPECTED) {
					const lines = expected.get(rule.key);
					if (lines) console.log(dim(`    · ${rule.why(lines)}`));
				}
			}
			if (notable.length > 0) {
				console.log(`  ${yellow('Warnings worth a look')} (details in ${relLog}):`);
				for (const text of notable.slice(0, 12)) console.log(`    ${yellow('!')} ${text}`);
				if (notable.length > 12) console.log(`    … and ${notable.length - 12} more`);
			}
		}
	};
}
