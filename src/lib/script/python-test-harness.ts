/**
 * Test-only: runs a python3 script over a JSON input file and returns its JSON output.
 * Imported by tests (never by app code); it is the one place here that uses Node APIs.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** Runs `script` with `sys.argv[1]` = a JSON file holding `input`; the script prints JSON. */
export function runPythonJson(script: string, input: unknown): unknown {
	const dir = mkdtempSync(join(tmpdir(), 'phasewright-py-'));
	try {
		const inputPath = join(dir, 'input.json');
		const scriptPath = join(dir, 'check.py');
		writeFileSync(inputPath, JSON.stringify(input), 'utf8');
		writeFileSync(scriptPath, script, 'utf8');
		const run = spawnSync('python3', [scriptPath, inputPath], { encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
		if (run.error) throw new Error(`python3 could not be started: ${run.error.message}`);
		if (run.status !== 0) throw new Error(`python3 exited with ${String(run.status)}:\n${run.stderr}`);
		return JSON.parse(run.stdout) as unknown;
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}
