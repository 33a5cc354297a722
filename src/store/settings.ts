import type { RhythmDb } from './db.ts';
import { uuidV7 } from './uuid-v7.ts';

/** Keys of the tablet's own settings. */
export type SettingKey = 'deviceId' | 'currentUnitId' | 'demoWard' | 'persistentStorage';

/** A setting's value, or the fallback when it was never set. */
export async function readSetting<T>(db: RhythmDb, key: SettingKey, fallback: T): Promise<T> {
  const row = await db.settings.get(key);
  return row === undefined ? fallback : (row.value as T);
}

/** Stores one of the tablet's own settings. */
export async function writeSetting(db: RhythmDb, key: SettingKey, value: unknown): Promise<void> {
  await db.settings.put({ key, value });
}

/** This tablet's id, made once on first use and kept (every read and amendment names its device). */
export async function deviceIdOf(db: RhythmDb, nowMs: number): Promise<string> {
  return db.transaction('rw', db.settings, async () => {
    const existing = await db.settings.get('deviceId');
    if (typeof existing?.value === 'string') return existing.value;
    const id = `tablet-${uuidV7(nowMs)}`;
    await db.settings.put({ key: 'deviceId', value: id });
    return id;
  });
}
