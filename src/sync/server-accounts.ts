import { ValidationError } from '../core/field-error.ts';
import { defaultPinIterations, hashPin, pinPattern } from '../store/clinicians.ts';
import type { ClinicianRow, RhythmDb } from '../store/db.ts';
import type { ServerUser } from './sync-protocol.ts';
import { readSyncSetting, serverAccountIdsKey, writeSyncSetting } from './sync-settings.ts';

const toBase64 = (bytes: Uint8Array) => btoa(String.fromCharCode(...bytes));

/**
 * Makes a unit server account the tablet's way to unlock offline: after an online sign-in the
 * nurse picks a PIN for this tablet, kept only as a salted PBKDF2 hash (the same hashing the lock
 * screen checks). The clinician row takes the server user's id and role, so reads signed offline
 * name the account the server knows. Once a tablet holds server accounts, clinicians made only on
 * this tablet stop appearing on the lock screen; their rows (and every read they signed) are kept.
 */
export async function saveServerAccount(
  db: RhythmDb,
  input: { user: ServerUser; pin: string; pinRepeat?: string; iterations?: number },
  nowMs: number,
): Promise<ClinicianRow> {
  if (!pinPattern.test(input.pin)) throw new ValidationError([{ field: 'pin', message: 'pin: choose a PIN of 4 to 8 digits.', min: 4, max: 8 }]);
  if (input.pinRepeat !== undefined && input.pinRepeat !== input.pin) throw new ValidationError([{ field: 'pinRepeat', message: 'pinRepeat: the two PINs differ; type the same PIN twice.' }]);
  const salt = crypto.getRandomValues(new Uint8Array(16));
  const iterations = input.iterations ?? defaultPinIterations;
  const pinHash = await hashPin(input.pin, salt, iterations);
  return db.transaction('rw', [db.clinicians, db.settings], async () => {
    const existing = await db.clinicians.get(input.user.id);
    const row: ClinicianRow = {
      id: input.user.id,
      name: input.user.name,
      role: input.user.role,
      pinHash,
      pinSalt: toBase64(salt),
      pinIterations: iterations,
      active: true,
      createdAtMs: existing?.createdAtMs ?? nowMs,
    };
    await db.clinicians.put(row);
    const ids = new Set((await readSyncSetting<string[]>(db, serverAccountIdsKey)) ?? []);
    ids.add(row.id);
    await writeSyncSetting(db, serverAccountIdsKey, [...ids]);
    await db.clinicians.toCollection().modify((c) => {
      if (!ids.has(c.id)) c.active = false;
    });
    return row;
  });
}

/** Whether this server account can already unlock the tablet offline. */
export async function hasOfflineUnlock(db: RhythmDb, userId: string): Promise<boolean> {
  const ids = (await readSyncSetting<string[]>(db, serverAccountIdsKey)) ?? [];
  const row = await db.clinicians.get(userId);
  return ids.includes(userId) && row?.active === true;
}
