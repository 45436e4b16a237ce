/**
 * The chart cache holds only the most recently used charts in memory (least recently used
 * eviction, common practice for a bounded cache); with a cache folder, an evicted chart is
 * read back from disk.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ChartStore } from '../../src/cache/store.js';
import { tempDir } from './helpers.js';

describe('ChartStore in memory', () => {
  it('keeps at most `held` charts, dropping the least recently used', () => {
    const store = new ChartStore(null, 2);
    store.set('a', '<svg>a</svg>');
    store.set('b', '<svg>b</svg>');
    expect(store.get('a')).toBe('<svg>a</svg>'); // a is now the most recent
    store.set('c', '<svg>c</svg>');
    expect(store.size).toBe(2);
    expect(store.get('b')).toBeUndefined();
    expect(store.get('a')).toBe('<svg>a</svg>');
    expect(store.get('c')).toBe('<svg>c</svg>');
  });

  it('reads an evicted chart back from its folder', () => {
    const dir = join(tempDir('ll-charts-'), 'charts');
    mkdirSync(dir);
    const store = new ChartStore(dir, 1);
    store.set('a', '<svg>a</svg>');
    store.set('b', '<svg>b</svg>');
    expect(store.size).toBe(1);
    expect(store.get('a')).toBe('<svg>a</svg>');
    expect(store.size).toBe(1);
  });
});
