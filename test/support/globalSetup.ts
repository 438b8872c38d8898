// Once per `vitest run`: every test's temporary folders go under one private folder (TMPDIR, which
// the test processes inherit), and at the end every junit.xml any test wrote there is read by a
// strict XML 1.0 parser — CI systems refuse a whole junit.xml over one bad character — before the
// folder is removed.
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { XMLValidator } from 'fast-xml-parser';

function junitFiles(dir: string, depth: number, out: string[] = []): string[] {
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return out;
  }
  for (const name of names) {
    const full = path.join(dir, name);
    let info;
    try {
      info = statSync(full);
    } catch {
      continue;
    }
    if (info.isDirectory() && depth > 0) junitFiles(full, depth - 1, out);
    else if (name === 'junit.xml' && info.isFile()) out.push(full);
  }
  return out;
}

export default function setup(): () => void {
  const root = mkdtempSync(path.join(tmpdir(), 'footing-tests-'));
  process.env.TMPDIR = root;
  return () => {
    const files = junitFiles(root, 4);
    const bad = files.flatMap((file) => {
      const verdict = XMLValidator.validate(readFileSync(file, 'utf8'));
      return verdict === true ? [] : [`${file}: ${verdict.err.msg} (line ${verdict.err.line})`];
    });
    if (bad.length === 0) rmSync(root, { recursive: true, force: true });
    else {
      // vitest reports a teardown error but still exits 0: set the exit code ourselves.
      process.stderr.write(`FAIL strict XML check: junit.xml files that a strict XML parser refuses (kept under ${root}):\n${bad.join('\n')}\n`);
      process.exitCode = 1;
      return;
    }
    process.stdout.write(`strict XML check: ${files.length} junit.xml files written by the tests, all well-formed\n`);
  };
}
