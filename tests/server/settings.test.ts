import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { defaultSettings, isLoopbackHost, readSettings, settingDefinitions } from '../../src/server/settings.ts';

describe('settings', () => {
  it('defaults to loopback port 8080, ./data, SQLite, 12 h idle and 24 h sessions, quiet logs', () => {
    const result = readSettings({}, []);
    expect(result).toEqual({ ok: true, settings: defaultSettings });
    expect(defaultSettings).toMatchObject({ host: '127.0.0.1', port: 8080, dataDir: resolve('data'), databaseUrl: null, sessionIdleMinutes: 720, sessionMaxHours: 24, logLevel: 'warn' });
  });

  it('reads environment variables, and flags win over them', () => {
    const result = readSettings({ PORT: '9000', DATA_DIR: '/srv/rl', LOG_LEVEL: 'info' }, ['--port', '9100', '--session-idle-minutes=30', '--database-url', 'postgres://rl@db:5432/rl']);
    expect(result.ok && result.settings).toMatchObject({ port: 9100, dataDir: '/srv/rl', logLevel: 'info', sessionIdleMinutes: 30, databaseUrl: 'postgres://rl@db:5432/rl' });
  });

  it('refuses to bind beyond loopback without --allow-remote', () => {
    const refused = readSettings({ HOST: '0.0.0.0' }, []);
    expect(refused.ok).toBe(false);
    expect(!refused.ok && refused.errors[0]).toMatch(/^HOST 0\.0\.0\.0 can be reached from other machines.*--allow-remote/);
    expect(readSettings({ HOST: '0.0.0.0' }, ['--allow-remote']).ok).toBe(true);
    expect(readSettings({ HOST: '10.1.2.3', ALLOW_REMOTE: 'true' }, []).ok).toBe(true);
  });

  it('names the setting and its allowed range for every bad value', () => {
    const result = readSettings({ PORT: '70000', LOG_LEVEL: 'loud', SESSION_MAX_HOURS: 'x', DATABASE_URL: 'mysql://x' }, ['--nonsense']);
    expect(!result.ok && result.errors).toEqual([
      'PORT must be a whole number from 0 to 65535; got 70000',
      'DATABASE_URL must start with postgres:// or postgresql://',
      'SESSION_MAX_HOURS must be a whole number from 1 to 720; got x',
      'LOG_LEVEL must be one of silent, error, warn, info, debug; got loud',
      `unknown option --nonsense; the options are ${settingDefinitions.map((d) => d.flag).join(', ')}`,
    ]);
  });

  it('knows which addresses are loopback', () => {
    expect(['127.0.0.1', '127.8.9.10', 'localhost', '::1'].map(isLoopbackHost)).toEqual([true, true, true, true]);
    expect(['0.0.0.0', '192.168.1.5', '::', 'ward-server'].map(isLoopbackHost)).toEqual([false, false, false, false]);
  });

  it('is listed in full in the README, each setting with its flag and default', () => {
    const readme = readFileSync(resolve('README.md'), 'utf8');
    const section = readme.slice(readme.indexOf('## Settings'), readme.indexOf('\n## ', readme.indexOf('## Settings') + 5));
    for (const d of settingDefinitions) {
      const row = section.split('\n').find((line) => line.startsWith(`| \`${d.env}\` | \`${d.flag}\` |`));
      expect([d.env, row !== undefined]).toEqual([d.env, true]);
      const defaultCell = row?.split('|')[3]?.trim() ?? '';
      expect([d.env, d.defaultText === '(none: SQLite)' ? defaultCell === 'none (SQLite)' : defaultCell === `\`${d.defaultText}\``]).toEqual([d.env, true]);
    }
  });
});
