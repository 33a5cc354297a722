import { readFileSync } from 'node:fs';

/** The server's version: package.json's, read once at start. */
export const serverVersion: string = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version;
