import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { testShop, type TestShop } from '../helpers/db';
import { FAILING_RUN, GOOD_ASSEMBLY } from '../helpers/build-records';
import { applyMove } from '../../src/lib/server/units';
import { checkAccess } from '../../src/lib/server/access';
import type { Role } from '../../src/lib/domain/auth/roles';

const dir = mkdtempSync(join(tmpdir(), 'spoolyard-bal-api-'));
const dbFile = join(dir, 'api.db');
process.env.DATABASE_URL = dbFile;

let shop: TestShop;
let runs: typeof import('../../src/routes/api/units/[serial=serial]/balance-runs/+server');
let assembly: typeof import('../../src/routes/api/units/[serial=serial]/assembly/+server');

beforeAll(async () => {
	shop = testShop(dbFile);
	runs = await import('../../src/routes/api/units/[serial=serial]/balance-runs/+server');
	assembly = await import('../../src/routes/api/units/[serial=serial]/assembly/+server');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const call = (handler: (e: never) => Promise<Response> | Response, serial: string, role: Role, body?: unknown) =>
	handler({
		params: { serial },
		locals: { user: { id: shop.actors[role].id, role } },
		request: new Request('http://localhost/x', { method: body ? 'POST' : 'GET', headers: { 'content-type': 'application/json' }, body: body ? JSON.stringify(body) : undefined })
	} as never);

test('the JSON routes record and list runs and assembly records with the same checks', async () => {
	const [serial] = shop.receive();
	for (const [action, stationCode] of [['inspect', 'TEARDOWN-1'], ['accept', 'TEARDOWN-1'], ['clean', 'WASH'], ['machine', 'LATHE-A'], ['paint', 'PAINT']]) {
		expect(applyMove(shop.db, shop.actors.tech, { serial, action: action as never, stationCode, idempotencyKey: `${serial}-${action}` }).ok).toBe(true);
	}
	const refused = await call(assembly.POST, serial, 'tech', { ...GOOD_ASSEMBLY, endPlayMm: 0.2 });
	expect(refused.status).toBe(409);
	expect((await refused.json()).error.message).toBe('Refused: End play 0.200 mm is above the maximum 0.090 mm.');
	expect((await call(assembly.POST, serial, 'tech', { ...GOOD_ASSEMBLY, stationCode: 'BUILD-1' })).status).toBe(201);
	expect(applyMove(shop.db, shop.actors.tech, { serial, action: 'assemble', stationCode: 'BUILD-1', idempotencyKey: `${serial}-asm` }).ok).toBe(true);
	const run = await call(runs.POST, serial, 'tech', { ...FAILING_RUN, stationCode: 'BALANCE' });
	expect(run.status).toBe(201);
	const j = await run.json();
	expect(j.run.passed).toBe(false);
	expect(j.evaluation.corrections[0].amount).toBeCloseTo(20, 9);
	const bad = await call(runs.POST, serial, 'tech', { ...FAILING_RUN, stationCode: 'NOPE' });
	expect(bad.status).toBe(400);
	const list = await (await call(runs.GET, serial, 'office')).json();
	expect(list.runs).toHaveLength(1);
	expect((await call(runs.GET, 'SY-99999', 'office')).status).toBe(404);
});

test('who may reach the new routes', () => {
	// Source: the shop's roles — techs, leads and the owner record; the owner edits specs; everyone reads.
	expect(checkAccess('/api/units/[serial=serial]/balance-runs', 'POST', 'office')).toBe('forbidden');
	expect(checkAccess('/api/units/[serial=serial]/balance-runs', 'POST', 'tech')).toBe('allow');
	expect(checkAccess('/api/units/[serial=serial]/assembly', 'GET', 'office')).toBe('allow');
	expect(checkAccess('/(app)/units/[serial=serial]/balance', 'POST', 'office')).toBe('forbidden');
	expect(checkAccess('/(app)/units/[serial=serial]/assembly', 'POST', 'tech')).toBe('allow');
	expect(checkAccess('/(app)/models/[code=code]', 'POST', 'lead')).toBe('forbidden');
	expect(checkAccess('/(app)/models/[code=code]', 'POST', 'owner')).toBe('allow');
	expect(checkAccess('/(app)/models', 'GET', 'tech')).toBe('allow');
});
