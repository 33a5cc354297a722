import { fireEvent, screen, waitFor, within } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { AuditTrail } from '../../src/app/screens/audit/AuditTrail.tsx';
import { auditDateRange, auditKindText, tabletTimeGapText } from '../../src/app/screens/audit/audit-words.ts';
import type { ClinicianRow } from '../../src/store/db.ts';
import type { AuditEvent } from '../../src/sync/audit-trail.ts';
import type { ServerConnection, SyncFetch } from '../../src/sync/server-call.ts';
import { deviceKey, sessionKey, writeSyncSetting } from '../../src/sync/sync-settings.ts';
import { seededDb } from '../store/fixtures.ts';
import { nurse, renderCharting } from './charting-fixture.tsx';

// The audit screen against a fake unit server: every request is recorded and answered from canned
// events. Invented staff, tablets and record ids; the unit clock is Europe/London.

const admin: ClinicianRow = { ...nurse, id: 'user-admin-01', name: 'Cy Admin', role: 'unit-admin' };
const serverUser = (role: 'nurse' | 'unit-admin', id = admin.id, name = admin.name) => ({ id, name, username: 'cy', role, unitId: 'unit-test-0001' });
/** 14 July 2026, 09:00 in London (08:00 UTC). */
const morningMs = Date.UTC(2026, 6, 14, 8, 0);

function event(id: number, fields: Partial<AuditEvent> = {}): AuditEvent {
  return { id, unitId: 'unit-test-0001', kind: 'read.signed', userId: 'user-ash-01', username: 'ash', recordId: `read-${id}`, deviceId: 'device-bay-a', clientTimeMs: morningMs - id * 60_000, serverTimeMs: morningMs - id * 60_000, detail: null, ...fields };
}

interface FakeServer {
  connection: ServerConnection;
  auditUrls: string[];
  requests: Array<{ url: string; headers: Record<string, string> }>;
  offline: boolean;
}

/** A fake unit server holding `total` events numbered total..1, newest first; `before` and `limit` page them. */
function fakeServer(total: number, extra: (id: number) => Partial<AuditEvent> = () => ({})): FakeServer {
  const all = Array.from({ length: total }, (_, i) => event(total - i, extra(total - i)));
  const server: FakeServer = { connection: undefined as unknown as ServerConnection, auditUrls: [], requests: [], offline: false };
  const fetch: SyncFetch = async (rawUrl, init) => {
    if (server.offline) throw new TypeError('Failed to fetch');
    const url = new URL(rawUrl, 'http://unit.test');
    server.requests.push({ url: url.pathname + url.search, headers: init.headers });
    const reply = (status: number, body: unknown) => ({ status, json: async () => body });
    if (url.pathname === '/api/users') return reply(200, { users: [{ id: 'user-ash-01', name: 'Ash Invented', username: 'ash', role: 'nurse', unitId: 'u', active: true }] });
    if (url.pathname === '/api/devices') return reply(200, { devices: [{ id: 'device-bay-a', label: 'Tablet bay A', enrolledBy: admin.id, enrolledAtMs: 0, revokedAtMs: null }] });
    if (url.pathname === '/api/audit') {
      server.auditUrls.push(url.search);
      const before = Number(url.searchParams.get('before') ?? Number.POSITIVE_INFINITY);
      const limit = Number(url.searchParams.get('limit'));
      return reply(200, { events: all.filter((e) => e.id < before).slice(0, limit) });
    }
    return reply(404, { error: 'not found' });
  };
  server.connection = { fetch, baseUrl: '', setTimeout: (run, ms) => setTimeout(run, ms), clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>), requestTimeoutMs: 5_000 };
  return server;
}

async function adminTablet(role: 'nurse' | 'unit-admin' = 'unit-admin') {
  const db = await seededDb();
  await writeSyncSetting(db, sessionKey, { token: 'session-admin', expiresAtMs: morningMs + 3_600_000, user: serverUser(role), signedInAtMs: morningMs });
  await writeSyncSetting(db, deviceKey, { deviceId: 'device-desk', deviceToken: 'device-token-desk' });
  return db;
}

describe('the audit trail screen', () => {
  it('lists the newest events in plain words with both clocks, the account name and the tablet label, asking the server with the session and device tokens', async () => {
    const server = fakeServer(3, (id) => (id === 2 ? { kind: 'sign-in.failed', recordId: null, detail: 'wrong password', clientTimeMs: null } : id === 1 ? { clientTimeMs: morningMs - 60_000 - 6 * 3_600_000 } : {}));
    await renderCharting(<AuditTrail connection={server.connection} pageSize={50} />, { db: await adminTablet(), clinician: admin });
    const cells = () => within(screen.getByRole('table')).getAllByRole('row').slice(1).map((r) => Array.from(r.querySelectorAll('th, td')).map((c) => c.textContent));
    await screen.findByRole('table');
    // The names of accounts and tablets arrive just after the events.
    await waitFor(() => expect(cells()[0]?.[4]).toBe('Tablet bay A'));
    expect(cells()).toEqual([
      ['Tue 14 Jul, 08:57', 'Tue 14 Jul, 08:57', 'Read signed', 'Ash Invented (ash)', 'Tablet bay A', 'read-3', ''],
      ['Tue 14 Jul, 08:58', '—', 'Sign-in failed', 'Ash Invented (ash)', 'Tablet bay A', '—', 'wrong password'],
      ['Tue 14 Jul, 08:59', 'Tue 14 Jul, 02:59 (tablet time 6 h 00 min earlier)', 'Read signed', 'Ash Invented (ash)', 'Tablet bay A', 'read-1', ''],
    ]);
    expect(screen.getByText('Page 1: 3 events')).toBeTruthy();
    expect(server.auditUrls).toEqual(['?limit=51']);
    const auditCall = server.requests.find((r) => r.url.startsWith('/api/audit'));
    expect(auditCall?.headers).toMatchObject({ authorization: 'Bearer session-admin', 'x-device-token': 'device-token-desk' });
  });

  it('filters by what happened, who and a range of days on the unit clock, both days included', async () => {
    const server = fakeServer(3);
    await renderCharting(<AuditTrail connection={server.connection} />, { db: await adminTablet(), clinician: admin });
    await screen.findByRole('table');
    await screen.findByRole('option', { name: 'Ash Invented (ash)' });
    fireEvent.change(screen.getByLabelText('What happened'), { target: { value: 'read.signed' } });
    fireEvent.change(screen.getByLabelText('Who'), { target: { value: 'user-ash-01' } });
    fireEvent.input(screen.getByLabelText('From day'), { target: { value: '2026-07-13' } });
    fireEvent.input(screen.getByLabelText('To day (included)'), { target: { value: '2026-07-14' } });
    fireEvent.click(screen.getByRole('button', { name: 'Show events' }));
    // London is on summer time (UTC+1): 13 July 00:00 is 12 July 23:00 UTC; the 14th ends at 14 July 22:59:59.999 UTC.
    const from = Date.UTC(2026, 6, 12, 23, 0);
    const to = Date.UTC(2026, 6, 14, 23, 0) - 1;
    await waitFor(() => expect(server.auditUrls.at(-1)).toBe(`?kind=read.signed&userId=user-ash-01&from=${from}&to=${to}&limit=51`));
  });

  it('refuses a range that ends before it starts, naming the field, and asks the server nothing', async () => {
    const server = fakeServer(1);
    await renderCharting(<AuditTrail connection={server.connection} />, { db: await adminTablet(), clinician: admin });
    await screen.findByRole('table');
    fireEvent.input(screen.getByLabelText('From day'), { target: { value: '2026-07-14' } });
    fireEvent.input(screen.getByLabelText('To day (included)'), { target: { value: '2026-07-13' } });
    fireEvent.click(screen.getByRole('button', { name: 'Show events' }));
    expect((await screen.findByRole('alert')).textContent).toBe('To: the last day must be on or after the first day.');
    expect(server.auditUrls).toEqual(['?limit=51']);
  });

  it('pages back by event id and forward again: 120 events in pages of 50, 50 and 20', async () => {
    const server = fakeServer(120);
    await renderCharting(<AuditTrail connection={server.connection} />, { db: await adminTablet(), clinician: admin });
    await screen.findByText('Page 1: 50 events');
    expect(screen.getByRole('button', { name: 'Newer events' }).hasAttribute('disabled')).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Older events' }));
    await screen.findByText('Page 2: 50 events');
    expect(server.auditUrls.at(-1)).toBe('?before=71&limit=51');
    fireEvent.click(screen.getByRole('button', { name: 'Older events' }));
    await screen.findByText('Page 3: 20 events');
    expect(server.auditUrls.at(-1)).toBe('?before=21&limit=51');
    expect(screen.getByRole('button', { name: 'Older events' }).hasAttribute('disabled')).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Newer events' }));
    await screen.findByText('Page 2: 50 events');
    expect(within(screen.getByRole('table')).getAllByRole('row')[1]?.textContent).toContain('read-70');
  });

  it('says the audit trail needs the unit server when the tablet is offline, and loads once it is back', async () => {
    const server = fakeServer(2);
    server.offline = true;
    await renderCharting(<AuditTrail connection={server.connection} />, { db: await adminTablet(), clinician: admin });
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toMatch(/^Needs the unit server\. The audit trail is kept on the unit server, and this tablet cannot reach it now/);
    expect(screen.queryByRole('table')).toBeNull();
    server.offline = false;
    fireEvent.click(screen.getByRole('button', { name: 'Try again' }));
    expect(await screen.findByText('Page 1: 2 events')).toBeTruthy();
  });

  it('shows nothing of the trail to a nurse, and asks nothing of the server', async () => {
    const server = fakeServer(2);
    await renderCharting(<AuditTrail connection={server.connection} />, { db: await adminTablet(), clinician: nurse });
    expect(screen.getByText('The audit trail is for unit admins. Ask your unit admin if you need to know who did what.')).toBeTruthy();
    await new Promise((r) => setTimeout(r, 50));
    expect(server.requests).toEqual([]);
  });

  it('asks a unit admin to sign in to the unit server when the tablet holds only a nurse\'s session', async () => {
    const server = fakeServer(2);
    await renderCharting(<AuditTrail connection={server.connection} />, { db: await adminTablet('nurse'), clinician: admin });
    expect(await screen.findByText(/Reading it needs a unit admin signed in to the unit server on this tablet \(now signed in: Cy Admin, nurse\)/)).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Sign in' })).toBeTruthy();
    expect(server.auditUrls).toEqual([]);
  });
});

describe('audit words', () => {
  it('names every kind the server writes in plain words, and shows an unknown kind as it came', () => {
    expect(auditKindText('change.rejected')).toBe('Change refused by the server');
    expect(auditKindText('handover.received')).toBe('Handover received');
    expect(auditKindText('something.new')).toBe('something.new');
  });

  it('turns local days into server times across the spring clock change (a 23-hour day)', () => {
    // 29 March 2026: London springs forward at 01:00 UTC, so the day runs 00:00 UTC to 23:00 UTC.
    expect(auditDateRange('2026-03-29', '2026-03-29', 'Europe/London')).toEqual({ fromMs: Date.UTC(2026, 2, 29, 0, 0), toMs: Date.UTC(2026, 2, 29, 23, 0) - 1 });
  });

  describe('edge cases', () => {
    it('leaves open ends open, and names a malformed date', () => {
      expect(auditDateRange('', '', 'Europe/London')).toEqual({});
      expect(() => auditDateRange('2026-02-30', '', 'Europe/London')).toThrow('From: "2026-02-30" is not a date (yyyy-MM-dd).');
    });

    it('says nothing of a tablet time within 2 minutes of the server, and says earlier or later beyond', () => {
      expect(tabletTimeGapText(null, morningMs)).toBeNull();
      expect(tabletTimeGapText(morningMs - 119_000, morningMs)).toBeNull();
      expect(tabletTimeGapText(morningMs + 45 * 60_000, morningMs)).toBe('tablet time 45 min later');
    });
  });
});
