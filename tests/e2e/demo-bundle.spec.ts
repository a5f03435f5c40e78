import { spawnSync } from 'node:child_process';
import { statSync } from 'node:fs';
import { test, expect, hydrated, query, signInAs, teamId } from './fixtures';

// The demo observation's page offers a simulated visibility bundle (issue 4, item 5); the file is
// made on first request by the server (python3 + numpy) and is readable without pickles.

async function demoObservationId(): Promise<string> {
	const team = await teamId('stellar-nurseries');
	const rows = await query<{ id: string }>("select id from observations where team_id = $1 and original_filename = 'corrie-flats-demo.json'", [team]);
	const id = rows[0]?.id;
	if (!id) throw new Error('the seeded demo observation is missing');
	return id;
}

const READ_BUNDLE = `
import json, sys
import numpy as np
with np.load(sys.argv[1], allow_pickle=False) as z:
    print(json.dumps({"format": str(z["format"]), "version": int(z["format_version"]), "array": str(z["array_name"]),
                      "n_ant": int(len(z["antenna_name"])), "n_chan": int(len(z["chan_freq"])), "fields": [str(f) for f in z["field_name"]]}))
`;

test('the demo observation page says its bundle is simulated and serves a readable .npz', async ({ page, context, baseURL }) => {
	test.setTimeout(90_000);
	await signInAs(context, baseURL ?? '', 'member');
	const id = await demoObservationId();
	await page.goto(`/observations/${id}`);
	await hydrated(page);
	const section = page.getByRole('region', { name: 'Simulated data to try a program on' });
	await expect(section).toContainText('It is simulated data, not a real observation.');
	const download = page.waitForEvent('download', { timeout: 60_000 });
	await section.getByRole('link', { name: 'Download the simulated bundle (.npz)' }).click();
	const file = await download;
	expect(file.suggestedFilename()).toBe('corrie-flats-demo-simulated.npz');
	const path = await file.path();
	expect(statSync(path).size).toBeLessThanOrEqual(5 * 1024 * 1024); // the download target (project choice)
	const read = spawnSync('python3', ['-c', READ_BUNDLE, path], { encoding: 'utf8' });
	expect(read.status, read.stderr).toBe(0);
	const info = JSON.parse(read.stdout) as { format: string; version: number; array: string; n_ant: number; n_chan: number; fields: string[] };
	expect(info.format).toBe('phasewright.visibility-bundle');
	expect(info.version).toBe(1);
	expect(info.array).toContain('(simulated)');
	// the demo summary: 28 dishes, 1024 channels, its four fields (DESIGN.md "Demo scenario")
	expect(info.n_ant).toBe(28);
	expect(info.n_chan).toBe(1024);
	expect(info.fields).toEqual(['3C286', 'CFA-GCAL-1', 'Nursery-North', 'Nursery-South']);
});

test('the bundle route answers with the headers of a download', async ({ context, baseURL }) => {
	test.setTimeout(90_000);
	await signInAs(context, baseURL ?? '', 'member');
	const id = await demoObservationId();
	const res = await context.request.get(`/api/v1/observations/${id}/demo-bundle`, { timeout: 60_000 });
	expect(res.status()).toBe(200);
	expect(res.headers()['content-type']).toBe('application/octet-stream');
	expect(res.headers()['content-disposition']).toBe('attachment; filename="corrie-flats-demo-simulated.npz"');
	// an .npz is a zip archive: local file header "PK\x03\x04" (PKWARE APPNOTE, from memory)
	expect((await res.body()).subarray(0, 4).toString('latin1')).toBe('PK\u0003\u0004');
});

test('an observation with the same summary but not the seeded demo has no bundle (404)', async ({ context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherMember');
	const demo = await demoObservationId();
	const tidewater = await teamId('tidewater-transients');
	// a copy of the demo summary in the other team, under another name, filename and hash (so no other
	// spec's upload of the same file conflicts with it); removed again at the end
	const inserted = await query<{ id: string }>(
		"insert into observations (team_id, name, original_bytes, original_filename, size_bytes, sha256, summary) select $1, name || ' (copy, bundle test)', original_bytes, 'copy-of-demo.json', size_bytes, encode(sha256(original_bytes || '\\x00'::bytea), 'hex'), summary from observations where id = $2 returning id",
		[tidewater, demo]
	);
	const copy = inserted[0];
	expect(copy).toBeDefined();
	const page = await context.request.get(`/observations/${copy?.id ?? ''}`);
	expect(page.status()).toBe(200); // the member can see the observation itself
	const res = await context.request.get(`/api/v1/observations/${copy?.id ?? ''}/demo-bundle`);
	expect(res.status()).toBe(404);
	expect(((await res.json()) as { error: { message: string } }).error.message).toContain('Only the demo observation');
	await query('delete from observations where id = $1', [copy?.id ?? '']);
});

test("another team's member gets 404 from the demo bundle route", async ({ context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherMember');
	const id = await demoObservationId();
	const res = await context.request.get(`/api/v1/observations/${id}/demo-bundle`);
	expect(res.status()).toBe(404);
	const body = (await res.json()) as { error: { code: string } };
	expect(body.error.code).toBe('not_found');
});

test('signed out, the demo bundle route answers 401 in JSON', async ({ request }) => {
	const id = await demoObservationId();
	const res = await request.get(`/api/v1/observations/${id}/demo-bundle`);
	expect(res.status()).toBe(401);
	expect(((await res.json()) as { error: { code: string } }).error.code).toBe('unauthenticated');
});
