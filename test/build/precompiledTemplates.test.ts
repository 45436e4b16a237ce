/**
 * The precompiled templates (src/report/templates.ts) are used only for the texts they were
 * made from. That they render the same pages as compiling at run time is checked by
 * test/e2e.test.ts: the program in dist/ uses them, and its demo site must equal the committed
 * one byte for byte.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readTemplateTexts } from '../../src/build.js';
import {
  PRECOMPILED_TEMPLATES_FILE,
  precompiledTemplatesSource,
  readPrecompiledTemplates,
} from '../../src/report/templates.js';
import { DIST, tempDir } from './helpers.js';

describe('precompiled templates', () => {
  const texts = readTemplateTexts();
  const file = join(tempDir('ll-hbs-'), 'templates.precompiled.cjs');
  writeFileSync(file, precompiledTemplatesSource(texts));

  it('are read back for the same texts, each page a template spec', () => {
    const specs = readPrecompiledTemplates(file, texts);
    expect(specs).not.toBeNull();
    for (const page of ['layout', 'index', 'session'] as const)
      expect(typeof (specs?.[page] as { main?: unknown } | undefined)?.main).toBe('function');
  });

  it('are ignored when a template differs, or the file is missing', () => {
    expect(readPrecompiledTemplates(file, { ...texts, session: `${texts.session} ` })).toBeNull();
    expect(readPrecompiledTemplates(join(tempDir('ll-hbs-'), 'none.cjs'), texts)).toBeNull();
  });

  it('are made by the build for the program in dist/, from the templates as they are now', () => {
    expect(readPrecompiledTemplates(join(DIST, 'report', PRECOMPILED_TEMPLATES_FILE), texts)).not.toBeNull();
  });
});
