// Every junit.xml a test writes is read back by a strict XML 1.0 parser (fast-xml-parser's
// XMLValidator): CI systems refuse the whole file over one bad character.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { expect } from 'vitest';

export function expectStrictJunit(resultsDir: string): void {
  const xml = readFileSync(path.join(resultsDir, 'junit.xml'), 'utf8');
  expect(XMLValidator.validate(xml, { allowBooleanAttributes: false })).toBe(true);
}
