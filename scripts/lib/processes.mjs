// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Child processes for the installs, the build, the fakes and the app, stopped together. Plain
// Node: it runs before `npm ci`. Each child gets its own process group, so stopping one stops
// whatever it started too (npm's scripts, Vite's workers, tsx's Node), and a signal sent to the
// script alone (as a process manager sends it) still reaches everything through stopChildren().
import { spawn } from 'node:child_process';
import {
	closeSync,
	openSync,
	readdirSync,
	readFileSync,
	readlinkSync,
	statSync,
	writeSync
} from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { ROOT } from './config.mjs';

const children = new Set();
let stopping = false;

/** Thrown when something is asked to start after a stop began. */
export class StopRequested extends Error {
	constructor() {
		super('stopping');
	}
}

/** True once stopChildren() has been called: nothing new starts after that. */
export const isStopping = () => stopping;

export const binPath = (name) => path.join(ROOT, 'node_modules', '.bin', name);

function track(child) {
	children.add(child);
	child.on('exit', () => children.delete(child));
	return child;
}

/** Sends a signal to a child's whole process group; false when it has already gone. */
function signalGroup(child, signal) {
	try {
		process.kill(-child.pid, signal);
		return true;
	} catch {
		return false;
	}
}

/**
 * Runs a command to completion with its output appended to `logFile` (nothing on the console).
 * Resolves with that output; rejects when it fails, with its last lines in the message.
 */
export function runLogged(cmd, args, { env = {}, logFile, cwd = ROOT } = {}) {
	if (stopping) return Promise.reject(new StopRequested());
	const fd = openSync(logFile, 'a');
	const start = statSync(logFile).size;
	return new Promise((resolve, reject) => {
		const child = track(
			spawn(cmd, args, {
				cwd,
				env: { ...process.env, ...env },
				stdio: ['ignore', fd, fd],
				detached: true
			})
		);
		const finish = (err) => {
			closeSync(fd);
			const output = readFileSync(logFile).subarray(start).toString('utf8');
			if (err) {
				const tail = output.trimEnd().split('\n').slice(-25).join('\n');
				reject(Object.assign(new Error(`${err}\n${tail}`), { output }));
			} else resolve(output);
		};
		child.once('error', (err) => finish(`${cmd} could not start: ${err.message}`));
		child.once('exit', (code, signal) => {
			if (stopping) finish(new StopRequested().message);
			else if (code === 0) finish(null);
			else finish(`${path.basename(cmd)} ${args.join(' ')} exited with ${code ?? signal}`);
		});
	});
}

/**
 * Runs a command with its output on the console (a test suite's). Resolves true when it exits 0.
 * It shares the terminal's process group, so Ctrl-C reaches it directly; stopChildren() ends it
 * otherwise.
 */
export function runVisible(cmd, args, { env = {}, cwd = ROOT } = {}) {
	if (stopping) return Promise.reject(new StopRequested());
	return new Promise((resolve) => {
		const child = track(
			spawn(cmd, args, { cwd, env: { ...process.env, ...env }, stdio: 'inherit' })
		);
		child.once('error', () => resolve(false));
		child.once('exit', (code) => resolve(code === 0));
	});
}

/**
 * Starts a long-running child. Its output goes to `logFile` and is kept (the last 40 lines) for
 * error reports; once `echo` is on (after start-up) it also goes to the console, prefixed.
 */
export function startChild(name, cmd, args, env, { logFile } = {}) {
	if (stopping) throw new StopRequested();
	const child = track(
		spawn(cmd, args, {
			cwd: ROOT,
			env: { ...process.env, ...env },
			stdio: ['ignore', 'pipe', 'pipe'],
			detached: true
		})
	);
	const log = logFile ? openSync(logFile, 'a') : null;
	child.recent = [];
	child.echo = false;
	const onData = (stream) => (chunk) => {
		const lines = chunk
			.toString()
			.split('\n')
			.filter((l) => l.length)
			.map((l) => `[${name}] ${l}`);
		child.recent.push(...lines);
		child.recent.splice(0, Math.max(0, child.recent.length - 40));
		if (log !== null) appendLines(log, lines);
		if (child.echo) stream.write(`${lines.join('\n')}\n`);
	};
	child.stdout.on('data', onData(process.stdout));
	child.stderr.on('data', onData(process.stderr));
	// 'close' comes after the last output; 'exit' may come before it.
	child.on('close', () => {
		if (log !== null) closeSync(log);
	});
	return child;
}

function appendLines(fd, lines) {
	try {
		// Synchronous appends keep the log in order with the steps' own lines.
		writeSync(fd, `${lines.join('\n')}\n`);
	} catch {
		/* a full disk must not take the app down with it */
	}
}

/** Stops one child: SIGTERM to its group, SIGKILL after a grace period. */
export function stopChild(child, graceMs = 5000) {
	return new Promise((resolve) => {
		if (child.exitCode !== null || child.signalCode !== null) return resolve();
		const timer = setTimeout(() => signalGroup(child, 'SIGKILL'), graceMs);
		child.once('exit', () => {
			clearTimeout(timer);
			// Anything the child left behind in its group goes too.
			signalGroup(child, 'SIGKILL');
			resolve();
		});
		if (!signalGroup(child, 'SIGTERM')) child.kill('SIGTERM');
	});
}

/** Stops every child started here, and lets nothing new start. */
export async function stopChildren(graceMs = 5000) {
	stopping = true;
	await Promise.all([...children].map((child) => stopChild(child, graceMs)));
}

// --- Ports -------------------------------------------------------------------------------------

/** Resolves true when nothing holds host:port (a listen there succeeds), false when taken. */
export function portIsFree(port, host = '127.0.0.1') {
	return new Promise((resolve) => {
		const server = net.createServer();
		server.once('error', () => resolve(false));
		server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(true)));
	});
}

/** Socket inodes listening on a TCP port, from /proc/net/tcp{,6} (Linux); null elsewhere. */
function listeningInodes(port) {
	const inodes = new Set();
	let readable = false;
	for (const file of ['/proc/net/tcp', '/proc/net/tcp6']) {
		let text;
		try {
			text = readFileSync(file, 'utf8');
		} catch {
			continue;
		}
		readable = true;
		for (const line of text.split('\n').slice(1)) {
			const f = line.trim().split(/\s+/);
			// f[1] local address "ADDR:PORT" in hex, f[3] state (0A = LISTEN), f[9] inode.
			if (f.length < 10 || f[3] !== '0A') continue;
			if (parseInt(f[1].split(':').pop(), 16) === port) inodes.add(f[9]);
		}
	}
	return readable ? inodes : null;
}

function socketInodesOf(pid) {
	const out = new Set();
	try {
		for (const fd of readdirSync(`/proc/${pid}/fd`)) {
			try {
				const m = /^socket:\[(\d+)\]$/.exec(readlinkSync(`/proc/${pid}/fd/${fd}`));
				if (m) out.add(m[1]);
			} catch {
				/* closed meanwhile */
			}
		}
	} catch {
		/* gone, or not ours to read */
	}
	return out;
}

function allPids() {
	try {
		return readdirSync('/proc').filter((d) => /^\d+$/.test(d));
	} catch {
		return [];
	}
}

/** The process group of a pid (field 5 of /proc/<pid>/stat), or null. */
function processGroup(pid) {
	try {
		const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
		return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[2]);
	} catch {
		return null;
	}
}

/** Who listens on a port: `{ pid, command }`, when Linux's /proc tells; null when unknown. */
export function portOwner(port) {
	const inodes = listeningInodes(port);
	if (!inodes || inodes.size === 0) return null;
	for (const pid of allPids()) {
		if ([...socketInodesOf(pid)].some((i) => inodes.has(i))) {
			let command = '';
			try {
				command = readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').join(' ').trim();
			} catch {
				/* gone */
			}
			return { pid: Number(pid), command };
		}
	}
	return null;
}

/**
 * True when the port is listened on by `child` or a process in its group; where /proc is not
 * available, when anything listens there while the child is alive.
 */
async function listensInGroup(child, port) {
	const inodes = listeningInodes(port);
	if (inodes === null) {
		return new Promise((resolve) => {
			const socket = net.connect(port, '127.0.0.1');
			socket.once('connect', () => {
				socket.destroy();
				resolve(true);
			});
			socket.once('error', () => resolve(false));
		});
	}
	if (inodes.size === 0) return false;
	const group = allPids().filter((pid) => processGroup(pid) === child.pid);
	return group.some((pid) => [...socketInodesOf(pid)].some((i) => inodes.has(i)));
}

/**
 * Resolves once the child (or a process it started) listens on every port; rejects when it exits
 * first, with its last output, or after `timeoutMs`. Something else on the port does not count.
 */
export async function waitForChildPorts(child, ports, timeoutMs = 60_000) {
	const deadline = Date.now() + timeoutMs;
	const pending = new Set(ports);
	while (Date.now() < deadline) {
		if (stopping) throw new StopRequested();
		if (child.exitCode !== null || child.signalCode !== null) {
			throw new Error(
				`it stopped (exit ${child.exitCode ?? child.signalCode}) before listening on port ${[...pending].join(', ')}:\n${child.recent.join('\n')}`
			);
		}
		for (const port of [...pending]) if (await listensInGroup(child, port)) pending.delete(port);
		if (pending.size === 0) return;
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(
		`it did not listen on port ${[...pending].join(', ')} within ${timeoutMs / 1000} s:\n${child.recent.join('\n')}`
	);
}
