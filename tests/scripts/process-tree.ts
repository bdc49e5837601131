// What the start-script tests need to see processes and ports: the process tree below a pid from
// Linux's /proc, and ports the OS says are free.
import { readdirSync, readFileSync } from 'node:fs';
import net from 'node:net';

/** Ports the OS says are free right now. */
export async function freePorts(n: number): Promise<number[]> {
	const servers = await Promise.all(
		Array.from(
			{ length: n },
			() =>
				new Promise<net.Server>((resolve) => {
					const server = net.createServer();
					server.listen(0, '127.0.0.1', () => resolve(server));
				})
		)
	);
	const ports = servers.map((s) => (s.address() as net.AddressInfo).port);
	await Promise.all(servers.map((s) => new Promise((r) => s.close(r))));
	return ports;
}

/** Polls `test` every 200 ms; rejects naming `what` after `timeoutMs`. */
export async function waitFor(test: () => boolean, what: string, timeoutMs: number): Promise<void> {
	const deadline = Date.now() + timeoutMs;
	while (!test()) {
		if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
		await new Promise((r) => setTimeout(r, 200));
	}
}

/** A pid's state letter from /proc (Z for a zombie), or null when it is gone. */
function state(pid: number): string | null {
	try {
		const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
		return stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3);
	} catch {
		return null;
	}
}

/** True while the process runs (a zombie counts as gone). */
export const alive = (pid: number) => ![null, 'Z', 'X'].includes(state(pid));

function parentOf(pid: number): number | null {
	try {
		const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
		return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
	} catch {
		return null;
	}
}

/** Every live process below `root` in the process tree. */
export function descendants(root: number): number[] {
	const all = readdirSync('/proc')
		.filter((d) => /^\d+$/.test(d))
		.map(Number);
	const below = new Set([root]);
	let grew = true;
	while (grew) {
		grew = false;
		for (const pid of all) {
			const parent = parentOf(pid);
			if (parent !== null && below.has(parent) && !below.has(pid)) {
				below.add(pid);
				grew = true;
			}
		}
	}
	below.delete(root);
	return [...below].filter(alive);
}
