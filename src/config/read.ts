/** lineledger.yaml text → resolved ProjectConfig (paths made absolute against the file's folder). */
import type { Outcome } from '../diagnostics.js';
import { validateWith, validatorFor } from '../session/validate.js';
import { parseYamlSource } from '../session/yamlSource.js';
import { configFromDocument, type ProjectConfig } from './project.js';
import type { ProjectConfigDocument } from './schema.js';

export {
  CONFIG_FILE_NAME,
  DEFAULT_TITLE,
  type DefaultInstrument,
  defaultConfig,
  type ProjectConfig,
} from './project.js';

export function readProjectConfig(text: string, file: string): Outcome<ProjectConfig> {
  const parsed = parseYamlSource(text, file);
  if (!parsed.source) return { ok: false, diagnostics: parsed.diagnostics };
  const { document, diagnostics } = validateWith(
    validatorFor<ProjectConfigDocument>('config'),
    parsed.source,
    file,
  );
  if (!document) return { ok: false, diagnostics };
  return { ok: true, value: configFromDocument(document, file), warnings: [] };
}
