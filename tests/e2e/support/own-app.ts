/**
 * A second app process for tests that need one of their own (another ORIGIN, or a process to
 * watch through a database restart): the same build `npm test` made, on the same database and
 * fakes, on a port of its own. Stopped by the test that started it.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';

export interface OwnApp {
	url: string;
	process: ChildProcess;
	/** Everything the process wrote to stdout and stderr so far. */
	output: () => string;
	stop: () => Promise<void>;
}

const portOpen = (port: number) =>
	new Promise<boolean>((resolve) => {
		const socket = net.connect(port, '127.0.0.1');
		socket.once('connect', () => {
			socket.destroy();
			resolve(true);
		});
		socket.once('error', () => resolve(false));
	});

/**
 * Starts `node build-test-<shift>` with extra environment. `portOffset` keeps apps of different
 * spec files apart (the main app is on the configured port, offset 0).
 */
export async function startOwnApp(
	portOffset: number,
	env: Record<string, string>
): Promise<OwnApp> {
	// `npm test` serves its build (build-test-<shift>) on PORT = 3000 + shift (scripts/lib/config.mjs).
	const mainPort = Number(process.env.PORT ?? 4000);
	const port = mainPort + portOffset;
	const build = path.resolve(`build-test-${mainPort - 3000}`);
	let output = '';
	const child = spawn(process.execPath, [build], {
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: `http://127.0.0.1:${port}`,
			...env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	child.stdout?.on('data', (c: Buffer) => (output += c.toString()));
	child.stderr?.on('data', (c: Buffer) => (output += c.toString()));
	const deadline = Date.now() + 60_000;
	while (!(await portOpen(port))) {
		if (child.exitCode !== null) throw new Error(`the app exited (${child.exitCode}):\n${output}`);
		if (Date.now() > deadline) throw new Error(`the app did not listen on ${port}:\n${output}`);
		await new Promise((r) => setTimeout(r, 200));
	}
	return {
		url: `http://127.0.0.1:${port}`, // where to connect; ORIGIN may name another (e.g. https)
		process: child,
		output: () => output,
		stop: () =>
			new Promise<void>((resolve) => {
				if (child.exitCode !== null) return resolve();
				const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
				child.once('exit', () => {
					clearTimeout(timer);
					resolve();
				});
				child.kill('SIGTERM');
			})
	};
}
