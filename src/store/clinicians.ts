import { ValidationError } from '../core/field-error.ts';
import type { ClinicianRole, ClinicianRow, RhythmDb } from './db.ts';
import { withStorageFullCheck } from './storage-full.ts';
import { uuidV7 } from './uuid-v7.ts';

/**
 * PBKDF2 iterations for a local PIN. A 4-8 digit PIN cannot resist offline guessing at any cost,
 * so the count keeps unlocking quick at the bedside; the lock screen's wait after wrong PINs and
 * the server's own accounts are the real protection.
 */
export const defaultPinIterations = 100_000;
/** PINs are 4 to 8 digits: typed with a glove on a number pad. */
export const pinPattern = /^\d{4,8}$/;

const toBase64 = (bytes: Uint8Array) => btoa(String.fromCharCode(...bytes));
const fromBase64 = (text: string) => Uint8Array.from(atob(text), (c) => c.charCodeAt(0));

/** PBKDF2-SHA-256 of a PIN with the salt and iteration count, as base64. */
export async function hashPin(pin: string, salt: Uint8Array, iterations: number): Promise<string> {
  const key = await crypto.subtle.importKey('raw', new TextEncoder().encode(pin), 'PBKDF2', false, ['deriveBits']);
  const bits = await crypto.subtle.deriveBits({ name: 'PBKDF2', hash: 'SHA-256', salt: salt as BufferSource, iterations }, key, 256);
  return toBase64(new Uint8Array(bits));
}

/** Adds a clinician who may chart on this tablet; the PIN is stored only as a salted hash. */
export async function addClinician(
  db: RhythmDb,
  input: { name: string; role: ClinicianRole; pin: string; id?: string; iterations?: number },
  nowMs: number,
): Promise<ClinicianRow> {
  const name = input.name.trim();
  const errors = [];
  if (name.length < 2 || name.length > 120) errors.push({ field: 'name', message: 'name: type the name the team knows you by (2 to 120 characters).', min: 2, max: 120 });
  if (!pinPattern.test(input.pin)) errors.push({ field: 'pin', message: 'pin: choose a PIN of 4 to 8 digits.', min: 4, max: 8 });
  if (errors.length > 0) throw new ValidationError(errors);
  const salt = crypto.getRandomValues(new Uint8Array(16));
  const iterations = input.iterations ?? defaultPinIterations;
  const row: ClinicianRow = {
    id: input.id ?? `clin-${uuidV7(nowMs)}`,
    name,
    role: input.role,
    pinHash: await hashPin(input.pin, salt, iterations),
    pinSalt: toBase64(salt),
    pinIterations: iterations,
    active: true,
    createdAtMs: nowMs,
  };
  await withStorageFullCheck(() =>
    db.transaction('rw', db.clinicians, async () => {
      const same = (await db.clinicians.toArray()).find((c) => c.active && c.name.toLowerCase() === name.toLowerCase());
      if (same) throw new ValidationError([{ field: 'name', message: `name: "${name}" is already on this tablet; add initials to tell them apart.` }]);
      await db.clinicians.add(row);
    }),
  );
  return row;
}

/** Clinicians who may chart on this tablet, by name. */
export async function listClinicians(db: RhythmDb): Promise<ClinicianRow[]> {
  const rows = await db.clinicians.toArray();
  return rows.filter((c) => c.active).sort((a, b) => a.name.localeCompare(b.name));
}

/** The clinician when the PIN matches, otherwise null (unknown clinician or wrong PIN alike). */
export async function verifyPin(db: RhythmDb, clinicianId: string, pin: string): Promise<ClinicianRow | null> {
  const row = await db.clinicians.get(clinicianId);
  if (!row || !row.active) return null;
  const hash = await hashPin(pin, fromBase64(row.pinSalt), row.pinIterations);
  // Compare every character so the time taken does not tell how much of the hash matched.
  let difference = hash.length ^ row.pinHash.length;
  for (let i = 0; i < Math.min(hash.length, row.pinHash.length); i += 1) difference |= hash.charCodeAt(i) ^ row.pinHash.charCodeAt(i);
  return difference === 0 ? row : null;
}
