import { chmodSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildContentIdentity, localImportClosure } from '../../harness/builds/contentIdentity.js';
import { parseBuildSpec } from '../../harness/builds/spec.js';

function folder(): string {
  return mkdtempSync(join(tmpdir(), 'footing-identity-'));
}

describe('a build\'s content identity', () => {
  it('follows local imports of a module, .js specifiers resolving to the .ts beside them', () => {
    const dir = folder();
    mkdirSync(join(dir, 'lib'));
    writeFileSync(join(dir, 'ctl.ts'), "import { gain } from './lib/gain.js';\nexport * from \"./lib/extra\";\nimport 'node:fs';\n");
    writeFileSync(join(dir, 'lib', 'gain.ts'), "export const gain = 2; const later = () => import('./late.js');\n");
    writeFileSync(join(dir, 'lib', 'extra.ts'), 'export const extra = 1;\n');
    writeFileSync(join(dir, 'lib', 'late.js'), 'export default 3;\n');
    const files = localImportClosure(join(dir, 'ctl.ts')).map((f) => f.slice(dir.length + 1));
    expect(files).toEqual(['ctl.ts', 'lib/gain.ts', 'lib/extra.ts', 'lib/late.js']);
  });

  it('changes when a local import of the module is edited, and not when nothing is', () => {
    const dir = folder();
    writeFileSync(join(dir, 'ctl.ts'), "import { gain } from './gain.js';\nexport const createController = () => gain;\n");
    writeFileSync(join(dir, 'gain.ts'), 'export const gain = 2;\n');
    const spec = parseBuildSpec(`mine=${join(dir, 'ctl.ts')}`, dir);
    const before = buildContentIdentity(spec).sha256;
    expect(buildContentIdentity(spec).sha256).toBe(before);
    writeFileSync(join(dir, 'gain.ts'), 'export const gain = 3;\n');
    expect(buildContentIdentity(spec).sha256).not.toBe(before);
  });

  it('hashes a process build\'s program and the script it runs, and its options', () => {
    const dir = folder();
    writeFileSync(join(dir, 'ctl.py'), 'print(1)\n');
    const spec = parseBuildSpec(`py=exec:python3 ${join(dir, 'ctl.py')}`, dir);
    const identity = buildContentIdentity(spec);
    expect(identity.files.some((f) => f.endsWith('ctl.py'))).toBe(true);
    expect(identity.files.some((f) => /python3/.test(f))).toBe(true);
    writeFileSync(join(dir, 'ctl.py'), 'print(2)\n');
    expect(buildContentIdentity(spec).sha256).not.toBe(identity.sha256);
    const withOption = parseBuildSpec(`py=exec:python3 ${join(dir, 'ctl.py')}?gain=2`, dir);
    expect(buildContentIdentity(withOption).sha256).not.toBe(buildContentIdentity(spec).sha256);
  });

  it('is the same for two copies of one module in different folders', () => {
    const a = folder();
    const b = folder();
    for (const dir of [a, b]) {
      writeFileSync(join(dir, 'ctl.js'), "export * from './x.js';\n");
      writeFileSync(join(dir, 'x.js'), 'export const createController = () => null;\n');
      chmodSync(join(dir, 'x.js'), 0o644);
    }
    const id = (dir: string) => buildContentIdentity(parseBuildSpec(`m=${join(dir, 'ctl.js')}`, dir)).sha256;
    expect(id(a)).toBe(id(b));
  });

  it('covers the bundled reference controllers', () => {
    const identity = buildContentIdentity(parseBuildSpec('ref:governed', process.cwd()));
    expect(identity.files.some((f) => f.endsWith('erg.ts'))).toBe(true);
    expect(identity.sha256).not.toBe(buildContentIdentity(parseBuildSpec('ref:nominal', process.cwd())).sha256);
  });
});
