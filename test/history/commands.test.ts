import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { historyAdd, historyExport, historyList, historyReport } from '../../harness/history/commands.js';
import { generateNight } from '../../harness/history/generate.js';
import { DEFAULT_HISTORY_FILE } from '../../harness/history/location.js';
import { PROGRESS_EVERY_RUNS } from '../../harness/history/sqliteStore.js';
import { FOOTING_ROOT } from '../builds/git/repo.js';

function project(nights: number, shape = { nights, scenarios: 3, builds: 2, seed: 9 }) {
  const dir = mkdtempSync(path.join(tmpdir(), 'footing-history-cmd-'));
  const files = Array.from({ length: nights }, (_, k) => {
    const file = path.join(dir, `night-${k}.json`);
    writeFileSync(file, JSON.stringify(generateNight(shape, k)));
    return file;
  });
  return { dir, files };
}

describe('footing history add / list / export (functions, no CLI)', () => {
  it('stores nights in the project\'s .footing folder, which ignores itself in git', () => {
    const { dir, files } = project(3);
    const added = historyAdd({ results: files, cwd: dir });
    expect(added.exitCode).toBe(0);
    expect(added.lines.filter((l) => l.startsWith('history: added night'))).toHaveLength(3);
    expect(existsSync(path.join(dir, DEFAULT_HISTORY_FILE))).toBe(true);
    expect(readFileSync(path.join(dir, '.footing', '.gitignore'), 'utf8')).toMatch(/^\*$/m);
    const listed = historyList({ cwd: dir });
    expect(listed.lines[0]).toBe('3 nights in .footing/history.sqlite');
    const again = historyAdd({ results: [files[1]], cwd: dir });
    expect(again.lines[1]).toMatch(/^history: already in the store, nothing changed/);
    expect(historyList({ cwd: dir }).lines[0]).toBe('3 nights in .footing/history.sqlite');
  });

  it('uses the config\'s history path, relative to the config file', () => {
    const { dir, files } = project(1);
    writeFileSync(path.join(dir, 'footing.config.yaml'), 'version: 1\nhistory: records/nights.sqlite\n');
    expect(historyAdd({ results: files, cwd: dir }).exitCode).toBe(0);
    expect(existsSync(path.join(dir, 'records', 'nights.sqlite'))).toBe(true);
  });

  it('adds nothing when any results file is unreadable, and says which (exit 2)', () => {
    const { dir, files } = project(2);
    writeFileSync(path.join(dir, 'broken.json'), '{"format": "footing-results"');
    const outcome = historyAdd({ results: [files[0], path.join(dir, 'broken.json'), files[1]], cwd: dir });
    expect(outcome.exitCode).toBe(2);
    expect(outcome.lines[0]).toMatch(/broken\.json: not valid JSON/);
    expect(existsSync(path.join(dir, DEFAULT_HISTORY_FILE))).toBe(false);
    expect(historyAdd({ results: files, commit: 'main', cwd: dir }).lines[0]).toMatch(/--commit "main": expected a commit id/);
    expect(historyList({ cwd: dir }).lines[0]).toMatch(/no history store there yet/);
  });

  it('files the nights under --commit and finds the last good night\'s commit', () => {
    const { dir, files } = project(2);
    historyAdd({ results: [files[0]], commit: 'a'.repeat(40), cwd: dir });
    historyAdd({ results: [files[1]], commit: 'b'.repeat(40), cwd: dir });
    expect(historyList({ cwd: dir, lastGood: true })).toEqual({ exitCode: 0, lines: ['b'.repeat(40)] });
    const json = JSON.parse(historyList({ cwd: dir, json: true }).lines.join('\n'));
    expect(json.nights.map((n: { commit: string }) => n.commit)).toEqual(['a'.repeat(40), 'b'.repeat(40)]);
  });

  it('exports one CSV row per stored value, readable by a CSV parser', () => {
    const { dir, files } = project(2);
    historyAdd({ results: files, cwd: dir });
    const outcome = historyExport({ csv: true, out: 'history.csv', cwd: dir });
    expect(outcome.exitCode).toBe(0);
    const rows = parse(readFileSync(path.join(dir, 'history.csv'), 'utf8'), { columns: true }) as Record<string, string>[];
    expect(outcome.lines[0]).toBe(`history: wrote ${rows.length} metric values to history.csv`);
    const margin = rows.filter((r) => r.metric === 'frictionMargin.min' && r.scenario === 'generated-001' && r.build === 'build-1');
    const night = JSON.parse(readFileSync(files[1], 'utf8'));
    const run = night.runs.find((r: { scenario: { id: string }; build: string }) => r.scenario.id === 'generated-001' && r.build === 'build-1');
    expect(Number(margin[1].value)).toBe(run.metrics.frictionMargin.min);
    expect(margin[1].started_at).toBe(night.startedAt);
    expect(historyExport({ csv: false, cwd: dir }).exitCode).toBe(2);
  });

  it('writes the trend page and refuses unknown metrics and bad flags (exit 2)', () => {
    const { dir, files } = project(4);
    historyAdd({ results: files, cwd: dir });
    const outcome = historyReport({ out: 'trend.html', cwd: dir });
    expect(outcome.exitCode).toBe(0);
    expect(outcome.lines.at(-1)).toMatch(/^history report: 4 nights, 36 trend lines, 0 change points → trend\.html/);
    expect(historyReport({ out: 'trend.html', metrics: ['frictionMargin.mean'], cwd: dir }).lines[0]).toMatch(/not a trend metric \(expected one of stanceMargin\.min/);
    expect(historyReport({ out: 'trend.pdf', cwd: dir }).exitCode).toBe(2);
    expect(historyReport({ out: 'trend.html', last: 1, cwd: dir }).exitCode).toBe(2);
  });
});

describe('footing history add, killed midway', () => {
  it('leaves the store readable with the earlier nights intact, and the interrupted night absent', async () => {
    const { dir, files } = project(3);
    historyAdd({ results: files, cwd: dir });
    const before = historyExport({ csv: true, cwd: dir }).lines;
    // A night big enough to be mid-write for a good second after its first progress line.
    const big = path.join(dir, 'big.json');
    writeFileSync(big, JSON.stringify(generateNight({ nights: 1, scenarios: 2000, builds: 10, seed: 4 }, 0)));
    const child = spawn(process.execPath, [path.join(FOOTING_ROOT, 'bin', 'footing.js'), 'history', 'add', big], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    const killed = await new Promise<string>((settle) => {
      child.stderr.on('data', (chunk: Buffer) => {
        stderr += chunk.toString('utf8');
        // The progress line is printed inside the write transaction (sqliteStore.ts).
        if (stderr.includes(`history: ${PROGRESS_EVERY_RUNS}/20000 runs written`)) child.kill('SIGKILL');
      });
      child.on('close', (_code, signal) => settle(String(signal)));
    });
    expect(killed).toBe('SIGKILL');
    const raw = new Database(path.join(dir, DEFAULT_HISTORY_FILE));
    expect(raw.pragma('integrity_check', { simple: true })).toBe('ok');
    raw.close();
    expect(historyList({ cwd: dir }).lines[0]).toBe('3 nights in .footing/history.sqlite');
    expect(historyExport({ csv: true, cwd: dir }).lines).toEqual(before);
    // And the same night goes in whole on the next try.
    const retry = historyAdd({ results: [big], cwd: dir });
    expect(retry.lines[1]).toMatch(/^history: added night .* 20000 runs/);
  });
});

describe('footing run --history (through the CLI function)', () => {
  it('adds the finished run to the store as one night', async () => {
    const { main } = await import('../../harness/cli/main.js');
    const dir = mkdtempSync(path.join(tmpdir(), 'footing-run-history-'));
    const scenario = path.join(FOOTING_ROOT, 'test', 'builds', 'git', 'fixtures', 'controller', 'scenarios', 'stand-dry.yaml');
    const store = path.join(dir, 'nights.sqlite');
    const code = await main(['run', scenario, '--build', 'governed=ref:governed', '--out', path.join(dir, 'out'), '--quiet', '--history', '--store', store]);
    expect(code).toBe(0);
    const listed = historyList({ store, cwd: dir });
    expect(listed.lines[0]).toBe('1 night in nights.sqlite');
    expect(listed.lines[1]).toMatch(/1 runs \(1 pass, 0 fail, 0 error\) · builds governed$/);
  });
});
