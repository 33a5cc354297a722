import { describe, expect, it } from 'vitest';
import { coreVersion } from '../../src/core/core-version.ts';

describe('coreVersion', () => {
  it('is a semantic version string', () => {
    expect(coreVersion).toMatch(/^\d+\.\d+\.\d+$/);
  });
});
