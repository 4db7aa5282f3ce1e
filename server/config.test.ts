import { resolve } from 'node:path';
import { describe, expect, test } from 'vitest';
import { ConfigError, devPagesEnabled, loadConfig } from './config';

describe('loadConfig', () => {
  test('defaults', () => {
    const config = loadConfig({});
    expect(config.port).toBe(3000);
    expect(config.dataDir).toBe(resolve('./data'));
    expect(config.dbFile).toBe(resolve('./data/quarry.db'));
    expect(config.blobDir).toBe(resolve('./data/blobs'));
    expect(config.tmpDir).toBe(resolve('./data/tmp'));
    expect(config.smtpUrl).toBeNull();
    expect(config.demoMode).toBe(true);
    expect(config.devMode).toBe(false);
    expect(config.invitationTtlDays).toBe(7);
    expect(config.sessionTtlHours).toBe(12);
    // The documented upload limits, written out (not the constant the config reads).
    expect(config.upload).toEqual({
      maxFileBytes: 100 * 1024 * 1024,
      maxFilesPerRequest: 500,
      maxRequestBytes: 1024 * 1024 * 1024,
      maxArchiveEntries: 10_000,
      maxArchiveUnpackedBytes: 2 * 1024 * 1024 * 1024,
      maxArchiveDepth: 3,
    });
    expect(config.rebuildFoldInShare).toBe(0.1);
    expect(config.rebuildDrift).toBe(0.35);
    expect(devPagesEnabled(config)).toBe(true);
  });

  test('reads the environment', () => {
    const config = loadConfig({
      PORT: '8080',
      QUARRY_DATA_DIR: '/srv/quarry',
      SMTP_URL: 'smtp://mail.example.com:587',
      QUARRY_DEMO: '0',
      QUARRY_PUBLIC_ORIGIN: 'https://quarry.example.com/some/path',
      QUARRY_MAX_FILE_BYTES: '1024',
      QUARRY_TRUST_PROXY: '1',
    });
    expect(config.port).toBe(8080);
    expect(config.dbFile).toBe('/srv/quarry/quarry.db');
    expect(config.smtpUrl).toBe('smtp://mail.example.com:587');
    expect(config.demoMode).toBe(false);
    expect(devPagesEnabled(config)).toBe(false);
    expect(config.publicOrigin).toBe('https://quarry.example.com');
    expect(config.upload.maxFileBytes).toBe(1024);
    expect(config.trustProxy).toBe(1);
  });

  test('npm run dev puts the API on QUARRY_API_PORT (3001)', () => {
    expect(loadConfig({ QUARRY_DEV: '1' }).port).toBe(3001);
    expect(loadConfig({ QUARRY_DEV: '1', QUARRY_API_PORT: '4001' }).port).toBe(4001);
  });

  test.each([
    [{ PORT: 'eighty' }, 'PORT'],
    [{ PORT: '70000' }, 'PORT'],
    [{ QUARRY_DEMO: 'maybe' }, 'QUARRY_DEMO'],
    [{ SMTP_URL: 'http://mail' }, 'SMTP_URL'],
    [{ QUARRY_MAX_FILE_BYTES: '-5' }, 'QUARRY_MAX_FILE_BYTES'],
    [{ QUARRY_PUBLIC_ORIGIN: 'not a url' }, 'QUARRY_PUBLIC_ORIGIN'],
    [{ QUARRY_REBUILD_FOLD_IN_SHARE: '2' }, 'QUARRY_REBUILD_FOLD_IN_SHARE'],
    [{ QUARRY_REBUILD_DRIFT: '0' }, 'QUARRY_REBUILD_DRIFT'],
  ])('a bad value names the variable: %o', (env, variable) => {
    expect(() => loadConfig(env)).toThrow(ConfigError);
    expect(() => loadConfig(env)).toThrow(new RegExp(`^${variable}: `));
  });
});
