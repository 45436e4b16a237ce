import { describe, expect, it } from 'vitest';
import { readProjectConfig } from '../src/config/read.js';
import { readSessionText } from '../src/session/read.js';

describe('project config (lineledger.yaml)', () => {
  it('resolves folders against the config file and reads the site settings', () => {
    const r = readProjectConfig(
      'lineledger-project: 1\ntitle: Club\nsessions: runs\nout: public\n',
      '/arch/lineledger.yaml',
    );
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    expect(r.value).toMatchObject({ title: 'Club', sessionsDir: '/arch/runs', outDir: '/arch/public' });
  });

  it('reports a misspelt key with its position', () => {
    const r = readProjectConfig('lineledger-project: 1\ntitel: Club\n', 'lineledger.yaml');
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.diagnostics[0]).toMatchObject({
        line: 2,
        col: 1,
        code: 'unknown-key',
        hint: 'did you mean "title"?',
      });
  });

  it('gives sessions its default instrument only where they say nothing', () => {
    const defaults = {
      description: 'Club spectroscope',
      resolution_nm: 2,
      resolving_power: null,
      range_nm: [400, 700] as [number, number],
    };
    const bare = readSessionText('lineledger: 1\nlines: [{ wavelength: 500 }]\n', 'a.yaml', {
      instrumentDefaults: defaults,
    });
    const own = readSessionText(
      'lineledger: 1\ninstrument: { resolving_power: 900 }\nlines: [{ wavelength: 500 }]\n',
      'b.yaml',
      {
        instrumentDefaults: defaults,
      },
    );
    if (!bare.ok || !own.ok) throw new Error('should read');
    expect(bare.value.instrument).toEqual(defaults);
    expect(own.value.instrument).toMatchObject({
      resolution_nm: null,
      resolving_power: 900,
      range_nm: [400, 700],
    });
  });
});
