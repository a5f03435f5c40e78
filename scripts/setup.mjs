// Shared set-up for `npm start` and `npm test`: install what is missing, start the
// database, migrate, seed. Only Node's standard library here, so it runs before `npm ci`.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
const bin = (name) => path.join(projectDir, 'node_modules', '.bin', name);

/** Runs a command in the project folder, inheriting output; throws when it fails. */
export function sh(cmd, args, env = {}) {
	const r = spawnSync(cmd, args, { cwd: projectDir, stdio: 'inherit', env: { ...process.env, ...env } });
	if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status ?? r.signal}`);
}

/** Like sh() but resolves with the exit code (for test layers that may fail). */
export function shStatus(cmd, args, env = {}) {
	return new Promise((resolve) => {
		const child = spawn(cmd, args, { cwd: projectDir, stdio: 'inherit', env: { ...process.env, ...env } });
		child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)));
	});
}

/** `npm ci` when node_modules is absent or stale. */
export function ensureNodeModules() {
	const marker = path.join(projectDir, 'node_modules', '.package-lock.json');
	if (existsSync(marker)) return;
	console.log('[setup] installing npm packages (npm ci) …');
	sh('npm', ['ci', '--no-audit', '--no-fund']);
}

function aptInstall(pkgs) {
	if (!isRoot) return false;
	console.log(`[setup] installing Debian packages: ${pkgs.join(' ')} …`);
	spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
	const r = spawnSync('apt-get', ['install', '-y', '-qq', ...pkgs], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
	return r.status === 0;
}

/** Debian's Chromium for Playwright (never a downloaded browser). */
export function ensureChromium() {
	if (existsSync('/usr/bin/chromium')) return;
	if (!aptInstall(['chromium'])) throw new Error('Chromium is missing: install Debian\'s package (sudo apt-get install -y chromium).');
}

/** python3 with numpy, for the rendered-program tests. */
export function ensurePythonNumpy() {
	const ok = () => spawnSync('python3', ['-c', 'import numpy'], { stdio: 'ignore' }).status === 0;
	if (ok()) return;
	if (!aptInstall(['python3', 'python3-numpy']) || !ok()) {
		throw new Error('python3 with numpy is needed: install Debian\'s python3-numpy (sudo apt-get install -y python3-numpy).');
	}
}

/** SvelteKit's generated types and tsconfig paths (needed by tsx scripts and svelte-check). */
export function syncKit() {
	sh(bin('svelte-kit'), ['sync']);
}

/** Applies migrations and (optionally) the demo seed to the database at `url`. */
export function migrateAndSeed(url, { seed }) {
	sh(bin('tsx'), ['scripts/db.ts', 'migrate'], { DATABASE_URL: url });
	if (seed) sh(bin('tsx'), ['scripts/db.ts', 'seed'], { DATABASE_URL: url });
}

export const viteBin = bin('vite');
export const binPath = bin;
