import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createAtomicStream, isAtomicTempName, removeStaleTemps, writeFileAtomicSync } from '../../harness/files/atomic.js';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'footing-atomic-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe('atomic writes', () => {
  it('replace the whole file and leave no temporary behind', () => {
    const file = join(dir, 'sub', 'out.txt');
    writeFileAtomicSync(file, 'first');
    writeFileAtomicSync(file, 'second');
    expect(readFileSync(file, 'utf8')).toBe('second');
    expect(readdirSync(join(dir, 'sub'))).toEqual(['out.txt']);
  });

  it('keep a streamed file under a temporary name until closed', () => {
    const file = join(dir, 'trace.csv');
    writeFileSync(file, 'old');
    const stream = createAtomicStream(file, 8);
    stream.write('a,b\n');
    stream.write('1,2\n'); // passes the 8-byte chunk: flushed to the temporary
    expect(readFileSync(file, 'utf8')).toBe('old');
    stream.close();
    expect(readFileSync(file, 'utf8')).toBe('a,b\n1,2\n');
    expect(() => stream.write('x')).toThrow(/write after close/);
  });

  it('leave the target untouched and only a sweepable temporary when the writer is SIGKILLed', async () => {
    const file = join(dir, 'trace.csv');
    const moduleUrl = new URL('../../harness/files/atomic.ts', import.meta.url).href;
    const script = `
      import { createAtomicStream } from ${JSON.stringify(moduleUrl)};
      const s = createAtomicStream(${JSON.stringify(file)}, 16);
      for (let k = 0; k < 100; k++) s.write('row ' + k + '\\n');
      console.log('ready');
      setInterval(() => {}, 1000);
    `;
    const child = spawn(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], { stdio: ['ignore', 'pipe', 'inherit'] });
    await new Promise<void>((resolve, reject) => {
      child.stdout.on('data', (chunk: Buffer) => chunk.toString().includes('ready') && resolve());
      child.on('exit', (code) => reject(new Error(`child exited early with ${code}`)));
    });
    child.kill('SIGKILL');
    await new Promise((resolve) => child.on('exit', resolve));
    expect(existsSync(file)).toBe(false);
    const names = readdirSync(dir);
    expect(names).toHaveLength(1);
    expect(isAtomicTempName(names[0])).toBe(true);
    expect(removeStaleTemps(dir)).toEqual(names);
    expect(readdirSync(dir)).toEqual([]);
  });
});
