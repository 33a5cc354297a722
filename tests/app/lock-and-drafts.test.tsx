import { fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { App } from '../../src/app/App.tsx';
import { addClinician } from '../../src/store/clinicians.ts';
import { loadDraft } from '../../src/store/drafts.ts';
import { admitStay } from '../../src/store/stays.ts';
import { saveUnitSetup } from '../../src/store/unit-setup.ts';
import { bed, newTestDb, stay, t0, unit } from '../store/fixtures.ts';

async function tabletWithTwoNurses() {
  const db = newTestDb();
  await saveUnitSetup(db, { unit, beds: [bed] }, t0);
  await admitStay(db, stay, t0);
  const ann = await addClinician(db, { name: 'Ann Test', role: 'nurse', pin: '1357', iterations: 1_000 }, t0);
  const bob = await addClinician(db, { name: 'Bob Test', role: 'nurse', pin: '2468', iterations: 1_000 }, t0);
  return { db, ann, bob };
}

function goTo(hash: string) {
  location.hash = hash;
  window.dispatchEvent(new HashChangeEvent('hashchange'));
}

async function unlockAs(name: string, pin: string) {
  fireEvent.click(await screen.findByRole('button', { name }));
  fireEvent.input(screen.getByLabelText(`PIN for ${name}`), { target: { value: pin } });
  fireEvent.click(screen.getByRole('button', { name: 'Unlock' }));
}

describe('who is charting', () => {
  afterEach(() => goTo('#/beds'));

  it('refuses a wrong PIN and says how many tries remain', async () => {
    const { db } = await tabletWithTwoNurses();
    goTo('#/beds');
    render(<App db={db} />);
    await unlockAs('Ann Test', '0000');
    expect(await screen.findByText('That PIN does not match. 4 tries before a 30-second wait.')).toBeTruthy();
    expect(screen.queryByText('Beds now')).toBeNull();
  });

  it('unlocks with the right PIN and shows who is charting', async () => {
    const { db } = await tabletWithTwoNurses();
    goTo('#/beds');
    render(<App db={db} />);
    await unlockAs('Ann Test', '1357');
    expect(await screen.findByRole('heading', { name: 'Beds now' })).toBeTruthy();
    expect(screen.getByText('Ann Test', { selector: 'strong' })).toBeTruthy();
  });

  it('saves the draft on lock, hides patient data, and shows the draft only to its author', async () => {
    const { db, ann } = await tabletWithTwoNurses();
    goTo(`#/beds/${bed.id}/read`);
    render(<App db={db} />);
    await unlockAs('Ann Test', '1357');
    const qt = await screen.findByLabelText('QT count', { exact: true });
    fireEvent.input(qt, { target: { value: '9.5' } });
    fireEvent.click(screen.getByRole('button', { name: 'Lock screen' }));

    expect(await screen.findByRole('heading', { name: 'Who is charting?' })).toBeTruthy();
    expect(document.body.textContent).not.toContain('Q.Z.');
    expect((await loadDraft(db, ann.id, stay.id))?.form.qtSmallBoxes).toBe('9.5');

    await unlockAs('Bob Test', '2468');
    expect(((await screen.findByLabelText('QT count', { exact: true })) as HTMLInputElement).value).toBe('');
    fireEvent.click(screen.getByRole('button', { name: 'Lock screen' }));

    await unlockAs('Ann Test', '1357');
    await waitFor(() => expect((screen.getByLabelText('QT count', { exact: true }) as HTMLInputElement).value).toBe('9.5'));
    expect(screen.getByText(/Draft saved on this tablet/)).toBeTruthy();
  });
});
