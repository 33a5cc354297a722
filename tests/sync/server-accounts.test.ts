import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import { addClinician, listClinicians, verifyPin } from '../../src/store/clinicians.ts';
import { hasOfflineUnlock, saveServerAccount } from '../../src/sync/server-accounts.ts';
import { newTablet, t0 } from './sync-fixtures.ts';

const iterations = 1_000;
const ash = { id: 'user-ash', name: 'Ash Invented', username: 'ash', role: 'nurse' as const, unitId: 'unit-sync-0001' };

describe('saveServerAccount', () => {
  it('makes the server account a clinician of this tablet, with its id and role and a PIN that unlocks offline', async () => {
    const db = await newTablet();
    const row = await saveServerAccount(db, { user: ash, pin: '5190', pinRepeat: '5190', iterations }, t0);
    expect(row).toMatchObject({ id: 'user-ash', name: 'Ash Invented', role: 'nurse', active: true, pinIterations: iterations });
    expect(row.pinHash).not.toContain('5190');
    expect(await verifyPin(db, 'user-ash', '5190')).toMatchObject({ id: 'user-ash' });
    expect(await verifyPin(db, 'user-ash', '0000')).toBeNull();
    expect(await hasOfflineUnlock(db, 'user-ash')).toBe(true);
    expect(await hasOfflineUnlock(db, 'user-bay')).toBe(false);
  });

  it('replaces the PIN and role on a later sign-in, keeping one row per account', async () => {
    const db = await newTablet();
    await saveServerAccount(db, { user: ash, pin: '5190', iterations }, t0);
    await saveServerAccount(db, { user: { ...ash, role: 'charge-nurse' }, pin: '8642', iterations }, t0 + 1_000);
    expect(await db.clinicians.count()).toBe(1);
    expect(await verifyPin(db, 'user-ash', '5190')).toBeNull();
    expect(await verifyPin(db, 'user-ash', '8642')).toMatchObject({ role: 'charge-nurse', createdAtMs: t0 });
  });

  it('takes clinicians made only on this tablet off the lock screen once server accounts arrive, keeping their rows', async () => {
    const db = await newTablet();
    await addClinician(db, { name: 'Local Only', role: 'nurse', pin: '1357', iterations }, t0);
    await saveServerAccount(db, { user: ash, pin: '5190', iterations }, t0);
    expect((await listClinicians(db)).map((c) => c.id)).toEqual(['user-ash']);
    expect(await db.clinicians.count()).toBe(2);
  });

  describe('edge cases', () => {
    it('refuses a PIN that is not 4 to 8 digits, naming the field and range', async () => {
      const db = await newTablet();
      for (const pin of ['123', '123456789', '12a4', '']) {
        const attempt = saveServerAccount(db, { user: ash, pin, iterations }, t0);
        await expect(attempt).rejects.toBeInstanceOf(ValidationError);
        await expect(attempt).rejects.toMatchObject({ errors: [{ field: 'pin', min: 4, max: 8 }] });
      }
      expect(await db.clinicians.count()).toBe(0);
    });

    it('refuses two PINs that differ', async () => {
      const db = await newTablet();
      await expect(saveServerAccount(db, { user: ash, pin: '5190', pinRepeat: '5191', iterations }, t0)).rejects.toThrow('pinRepeat: the two PINs differ');
    });
  });
});
