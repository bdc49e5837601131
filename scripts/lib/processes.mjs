// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Child processes for the fakes and the app, stopped together.
import { spawn } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { ROOT } from './config.mjs';

const children = new Set();

/** Starts a long-running child with its output prefixed by its name. */
export function startChild(name, cmd, args, env) {
	const child = spawn(cmd, args, {
		cwd: ROOT,
		env: { ...process.env, ...env },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	const prefix = (chunk) =>
		chunk
			.toString()
			.split('\n')
			.filter((l) => l.length)
			.map((l) => `[${name}] ${l}`)
			.join('\n') + '\n';
	child.stdout.on('data', (c) => process.stdout.write(prefix(c)));
	child.stderr.on('data', (c) => process.stderr.write(prefix(c)));
	children.add(child);
	child.on('exit', () => children.delete(child));
	return child;
}

export const binPath = (name) => path.join(ROOT, 'node_modules', '.bin', name);

/** Resolves once something accepts TCP connections on the port, or rejects after `timeoutMs`. */
export async function waitForPort(port, timeoutMs = 30_000, child) {
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		if (child && child.exitCode !== null)
			throw new Error(`process exited (${child.exitCode}) before port ${port} opened`);
		const ok = await new Promise((resolve) => {
			const socket = net.connect(port, '127.0.0.1');
			socket.once('connect', () => {
				socket.destroy();
				resolve(true);
			});
			socket.once('error', () => resolve(false));
		});
		if (ok) return;
		await new Promise((r) => setTimeout(r, 250));
	}
	throw new Error(`Nothing listened on 127.0.0.1:${port} within ${timeoutMs} ms`);
}

/** Stops every child started here (SIGTERM, then SIGKILL after a grace period). */
export async function stopChildren(graceMs = 5000) {
	const waits = [...children].map(
		(child) =>
			new Promise((resolve) => {
				if (child.exitCode !== null) return resolve();
				const timer = setTimeout(() => child.kill('SIGKILL'), graceMs);
				child.once('exit', () => {
					clearTimeout(timer);
					resolve();
				});
				child.kill('SIGTERM');
			})
	);
	await Promise.all(waits);
}
