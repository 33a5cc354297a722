import { fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { h } from 'preact';
import { describe, expect, it } from 'vitest';
import { verifyPin } from '../../src/store/clinicians.ts';
import { listRefusedChanges, markRefusedSeen } from '../../src/sync/refused-changes.ts';
import { currentDevice, currentSession } from '../../src/sync/server-session.ts';
import { ServerSignIn } from '../../src/sync/ui/ServerSignIn.tsx';
import { SyncStatusBar } from '../../src/sync/ui/SyncStatusBar.tsx';
import { ManualClock, adminCy, connectionTo, engineFor, newServer, newTablet, nurseAsh, signInTablet, signReadAt, t0 } from './sync-fixtures.ts';

const pinIterations = 1_000;

describe('SyncStatusBar', () => {
  it('shows the status in words inside a polite live region, and updates as the engine works', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    await signReadAt(db, t0);
    await signReadAt(db, t0 + 60_000);
    const engine = await engineFor(db, server, clock);
    await engine.refresh();
    render(h(SyncStatusBar, { engine, timeZone: 'Europe/London', now: clock.now }));
    const region = screen.getByRole('status');
    expect(region.getAttribute('aria-live')).toBe('polite');
    expect(region.textContent).toBe('2 waiting to send · not yet synced with the unit server');
    clock.nowMs = t0 + 2 * 60_000;
    fireEvent.click(screen.getByRole('button', { name: 'Sync now' }));
    await waitFor(() => expect(screen.getByRole('status').textContent).toBe('All reads sent · last synced 08:02'));
    expect(server.reads.size).toBe(2);
  });

  it('keeps the retry countdown outside the live region, and offers the refused list only when there is one', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    await signReadAt(db, t0, { notes: 'refuse' });
    await signReadAt(db, t0 + 60_000);
    server.rejectWhen = (change) => (change.kind === 'read.sign' && change.record.notes === 'refuse' ? 'Refused for the test.' : null);
    const engine = await engineFor(db, server, clock);
    let opened = 0;
    render(h(SyncStatusBar, { engine, timeZone: 'Europe/London', now: clock.now, onShowRefused: () => { opened += 1; } }));
    expect(screen.queryByRole('button', { name: 'Show refused' })).toBeNull();
    await engine.syncNow();
    await signReadAt(db, t0 + 120_000);
    server.injectPushFault({ kind: 'status', status: 503 });
    engine.start();
    await waitFor(() => expect(screen.getByRole('status').textContent).toBe('1 read refused by the server — open it to see why · 1 waiting to send — the unit server has a problem'));
    expect(screen.getByText(/retrying in \d+ s/).closest('[role="status"]')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Show refused' }));
    expect(opened).toBe(1);
    engine.stop();
  });
});

describe('SyncStatusBar with refused changes already seen', () => {
  it('says nothing waits to send, and keeps a quiet way to the refused list', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    await signReadAt(db, t0, { notes: 'refuse' });
    server.rejectWhen = (change) => (change.kind === 'read.sign' && change.record.notes === 'refuse' ? 'Refused for the test.' : null);
    const engine = await engineFor(db, server, clock);
    await engine.syncNow();
    const [refused] = await listRefusedChanges(db);
    await markRefusedSeen(db, refused!.changeId, { id: nurseAsh.id, name: nurseAsh.name }, t0);
    await engine.refresh();
    let opened = 0;
    render(h(SyncStatusBar, { engine, timeZone: 'Europe/London', now: clock.now, onShowRefused: () => { opened += 1; } }));
    expect(screen.getByRole('status').textContent).toBe('Nothing waiting to send · last synced 08:00');
    expect(screen.queryByRole('button', { name: 'Show refused' })).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Refused changes (1 seen)' }));
    expect(opened).toBe(1);
  });
});

describe('ServerSignIn', () => {
  it('signs a nurse in, then saves the PIN chosen for offline unlock', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    const done: string[] = [];
    render(h(ServerSignIn, { db, connection: connectionTo(server, clock), now: clock.now, onDone: (user) => done.push(user.id), pinIterations }));
    fireEvent.input(screen.getByLabelText('Username'), { target: { value: nurseAsh.username } });
    fireEvent.input(screen.getByLabelText('Password'), { target: { value: nurseAsh.password } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await screen.findByText('Choose a PIN for this tablet');
    expect((await currentSession(db))?.user.id).toBe(nurseAsh.id);
    expect(screen.getByRole('note').textContent).toMatch(/not enrolled with the unit server yet/);
    fireEvent.input(screen.getByLabelText('PIN'), { target: { value: '4821' } });
    fireEvent.input(screen.getByLabelText('PIN again'), { target: { value: '4812' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save PIN' }));
    expect((await screen.findByRole('alert')).textContent).toBe('pinRepeat: the two PINs differ; type the same PIN twice.');
    fireEvent.input(screen.getByLabelText('PIN again'), { target: { value: '4821' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save PIN' }));
    await waitFor(() => expect(done).toEqual([nurseAsh.id]));
    expect(await verifyPin(db, nurseAsh.id, '4821')).toMatchObject({ id: nurseAsh.id, role: 'nurse' });
  });

  it('offers to enrol the tablet again when the server no longer knows its enrolment (withdrawn, or lost in a restore)', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    server.enrolledTokens.delete('device-token-1');
    render(h(ServerSignIn, { db, connection: connectionTo(server, clock), now: clock.now, onDone: () => undefined, pinIterations }));
    fireEvent.input(screen.getByLabelText('Username'), { target: { value: adminCy.username } });
    fireEvent.input(screen.getByLabelText('Password'), { target: { value: adminCy.password } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await screen.findByText('Enrol this tablet');
    fireEvent.input(screen.getByLabelText('Tablet name'), { target: { value: 'Tablet 1, bay A' } });
    fireEvent.click(screen.getByRole('button', { name: 'Enrol tablet' }));
    await screen.findByText('Choose a PIN for this tablet');
    expect(server.enrolledTokens.has('device-token-1')).toBe(true);
    expect(screen.queryByRole('note')).toBeNull();
  });

  it('goes straight to the PIN when the server still knows the tablet', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    render(h(ServerSignIn, { db, connection: connectionTo(server, clock), now: clock.now, onDone: () => undefined, pinIterations }));
    fireEvent.input(screen.getByLabelText('Username'), { target: { value: adminCy.username } });
    fireEvent.input(screen.getByLabelText('Password'), { target: { value: adminCy.password } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await screen.findByText('Choose a PIN for this tablet');
    expect(screen.queryByRole('note')).toBeNull();
  });

  it('tells the nurse when the server does not recognise the password, and keeps the form', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    render(h(ServerSignIn, { db, connection: connectionTo(server, clock), now: clock.now, onDone: () => undefined, pinIterations }));
    fireEvent.input(screen.getByLabelText('Username'), { target: { value: nurseAsh.username } });
    fireEvent.input(screen.getByLabelText('Password'), { target: { value: 'not the password' } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect((await screen.findByRole('alert')).textContent).toBe('That username and password were not recognised by the unit server.');
    expect(screen.getByLabelText('Username')).toBeTruthy();
    expect(await currentSession(db)).toBeNull();
  });

  it('has a unit admin enrol a new tablet before choosing a PIN', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    render(h(ServerSignIn, { db, connection: connectionTo(server, clock), now: clock.now, onDone: () => undefined, pinIterations }));
    fireEvent.input(screen.getByLabelText('Username'), { target: { value: adminCy.username } });
    fireEvent.input(screen.getByLabelText('Password'), { target: { value: adminCy.password } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await screen.findByText('Enrol this tablet');
    fireEvent.input(screen.getByLabelText('Tablet name'), { target: { value: 'Tablet 3, bay C' } });
    fireEvent.click(screen.getByRole('button', { name: 'Enrol tablet' }));
    await screen.findByText('Choose a PIN for this tablet');
    expect(screen.queryByRole('note')).toBeNull();
    expect(await currentDevice(db)).toEqual({ deviceId: 'device-1', deviceToken: 'device-token-1' });
  });
});
