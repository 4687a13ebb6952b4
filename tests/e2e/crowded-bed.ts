import assert from 'node:assert/strict';
import { randomUUID } from 'node:crypto';
import { ACCOUNTS, BASE_URL, PASSWORD } from './support';

/**
 * An infant in bed N12 carrying as many open flags as one stay can hold at once, set up through
 * the API as a charge nurse would chart it. Values and why each raises a flag (none taken from
 * the rules' code):
 * - remote site 38.4 °C axilla: fever, 38.0 °C and over (Bedside Clinical Guidelines Partnership);
 * - probe 35.6 °C against that remote site: 2.8 °C apart, well beyond any probe/remote-site gap a
 *   unit would accept (common practice: about 1 °C);
 * - heart rate 190/min with red, sweating skin: heat stress (a resting newborn's rate is 100–160,
 *   common practice);
 * - manual control at 90 % heater output, charted 50 minutes ago with no check since: manual mode
 *   beyond its limit (nothing regulates the heat; checks every 15 min, from memory);
 * - a skin-to-skin session with a 36.8 °C reference and a 0.5 °C limit during which the remote
 *   site read 38.4 °C: a skin-to-skin deviation;
 * - the probe on the abdomen of a prone infant: the placement prompt.
 * The bed is `apiBase`'s (the e2e server by default); returns the infant's id.
 */
export async function admitCrowdedInfant(apiBase = BASE_URL): Promise<{ infantId: string; name: string }> {
  const signIn = await fetch(`${apiBase}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: ACCOUNTS.charge, password: PASSWORD }),
  });
  assert.equal(signIn.status, 200);
  const charge = ((await signIn.json()) as { token: string }).token;
  const call = async (path: string, body?: unknown) => {
    const res = await fetch(`${apiBase}/api${path}`, {
      method: body ? 'POST' : 'GET',
      headers: { Authorization: `Bearer ${charge}`, ...(body ? { 'Content-Type': 'application/json' } : {}) },
      body: body ? JSON.stringify(body) : undefined,
    });
    const json = (await res.json()) as Record<string, unknown>;
    assert.ok(res.ok, `${path}: ${res.status} ${JSON.stringify(json)}`);
    return json;
  };
  const board = (await call('/units/unit-north/board')) as { beds: { bedId: string; label: string; infant: { id: string; displayName: string } | null }[] };
  const bed = board.beds.find((b) => b.label === 'N12');
  assert.ok(bed, 'the demo unit has a bed N12');
  const name = 'Baby Quillfeather';
  if (bed.infant) return { infantId: bed.infant.id, name: bed.infant.displayName };
  const now = Date.now();
  const admitted = (await call('/units/unit-north/infants', {
    bedId: bed.bedId,
    displayName: name,
    birthAt: new Date(now - 20 * 3_600_000).toISOString(),
    gestationWeeks: 33,
    gestationDays: 2,
    birthWeightGrams: 1840,
    heatSource: 'radiant-warmer',
    controlMode: 'manual',
    setTemperature: 36.5,
    tempUnit: 'C',
    probeSite: 'abdomen',
    probeCovered: true,
    position: 'prone',
  })) as { infant: { id: string } };
  const infantId = admitted.infant.id;
  await call(`/infants/${infantId}/skin-to-skin`, {
    id: randomUUID(),
    unit: 'C',
    reference: 36.8,
    limitCenti: 50,
    carer: 'Mother',
    startedAt: new Date(now - 52 * 60_000).toISOString(),
  });
  await call(`/infants/${infantId}/readings`, {
    id: randomUUID(),
    unit: 'C',
    takenAt: new Date(now - 50 * 60_000).toISOString(),
    lateReason: 'Charted after the transfer from delivery suite.',
    probe: 35.6,
    remote: 38.4,
    remoteSite: 'axilla',
    controlMode: 'manual',
    heaterOutputPct: 90,
    heartRate: 190,
    heatSigns: ['red-skin', 'sweating'],
  });
  return { infantId, name };
}
