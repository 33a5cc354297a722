import { describe, expect, it } from 'vitest';
import { addClinician, listClinicians, verifyPin } from '../../src/store/clinicians.ts';
import { newTestDb, t0 } from './fixtures.ts';

// Few iterations keep the tests quick; the count is stored per clinician, so this is the real code path.
const iterations = 1_000;

describe('local clinicians', () => {
  it('keeps the PIN only as a salted PBKDF2 hash', async () => {
    const db = newTestDb();
    const row = await addClinician(db, { name: 'Ann Test', role: 'nurse', pin: '4821', iterations }, t0);
    const stored = await db.clinicians.get(row.id);
    expect(JSON.stringify(stored)).not.toContain('4821');
    expect(stored?.pinIterations).toBe(iterations);
    expect(stored?.pinHash).toMatch(/^[A-Za-z0-9+/]{43}=$/);
  });

  it('gives two clinicians with the same PIN different hashes', async () => {
    const db = newTestDb();
    const a = await addClinician(db, { name: 'Ann Test', role: 'nurse', pin: '4821', iterations }, t0);
    const b = await addClinician(db, { name: 'Bob Test', role: 'nurse', pin: '4821', iterations }, t0);
    expect(a.pinHash).not.toBe(b.pinHash);
  });

  it('accepts the right PIN and refuses a wrong one', async () => {
    const db = newTestDb();
    const row = await addClinician(db, { name: 'Ann Test', role: 'charge-nurse', pin: '4821', iterations }, t0);
    expect((await verifyPin(db, row.id, '4821'))?.name).toBe('Ann Test');
    expect(await verifyPin(db, row.id, '4822')).toBeNull();
    expect(await verifyPin(db, 'clin-nobody', '4821')).toBeNull();
  });

  it('lists clinicians by name', async () => {
    const db = newTestDb();
    await addClinician(db, { name: 'Zed Test', role: 'nurse', pin: '1234', iterations }, t0);
    await addClinician(db, { name: 'Ann Test', role: 'unit-admin', pin: '1234', iterations }, t0);
    expect((await listClinicians(db)).map((c) => c.name)).toEqual(['Ann Test', 'Zed Test']);
  });

  describe('edge cases', () => {
    it.each(['123', '123456789', '12a4', ''])('refuses PIN "%s" with a message naming the pin and its length', async (pin) => {
      await expect(addClinician(newTestDb(), { name: 'Ann Test', role: 'nurse', pin, iterations }, t0)).rejects.toThrow(/pin: choose a PIN of 4 to 8 digits/);
    });
    it('refuses a one-letter name and a name already on the tablet', async () => {
      const db = newTestDb();
      await expect(addClinician(db, { name: 'A', role: 'nurse', pin: '1234', iterations }, t0)).rejects.toThrow(/name: type the name/);
      await addClinician(db, { name: 'Ann Test', role: 'nurse', pin: '1234', iterations }, t0);
      await expect(addClinician(db, { name: 'ann test', role: 'nurse', pin: '9999', iterations }, t0)).rejects.toThrow(/already on this tablet/);
    });
  });
});
