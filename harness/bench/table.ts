// The bench table as text lines: one row per figure with tinybench's mean, p50, p99, relative
// margin of error and sample count (per call), the rate, and the rate against the loop budget.

import type { BenchReport, RateFigure, TimingStats } from './types.js';

const HEADER = ['figure', 'mean', 'p50', 'p99', '±rme', 'samples', 'rate', 'vs budget'];

function duration(us: number): string {
  if (!Number.isFinite(us)) return 'n/a';
  if (us >= 1e6) return `${(us / 1e6).toFixed(2)} s`;
  if (us >= 1e3) return `${(us / 1e3).toFixed(2)} ms`;
  return `${us < 10 ? us.toFixed(3) : us.toFixed(1)} µs`;
}

/** Thousands grouped with thin spaces (SI style). */
export function groupThousands(value: number): string {
  if (!Number.isFinite(value)) return 'n/a';
  return Math.round(value).toString().replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
}

function statsCells(stats: TimingStats): string[] {
  return [
    duration(stats.mean_us),
    duration(stats.p50_us),
    duration(stats.p99_us),
    `${stats.rme_percent.toFixed(2)} %`,
    `${stats.samples}×${stats.batch}`,
  ];
}

function rateRow(label: string, figure: RateFigure, unit: string, budget: string): string[] {
  return [label, ...statsCells(figure), `${groupThousands(figure.perSecond)} ${unit}`, budget];
}

export function renderBenchTable(report: BenchReport): string[] {
  const rate = report.scenario.controlRate_Hz;
  const rows: string[][] = [];
  const plant = report.plant;
  rows.push(
    rateRow(
      `plant.step (${plant.footCount} feet${plant.allFeetInContact ? ' in contact' : ', NOT all in contact'})`,
      plant.steps,
      'steps/s',
      `${plant.realTimeFactor.toFixed(0)}× real time`,
    ),
  );
  for (const build of report.builds) {
    if (build.governor) {
      rows.push(rateRow(`${build.name} governor update`, build.governor, 'updates/s', `${build.governor.perControlPeriod.toFixed(0)} per ${rate} Hz period`));
    }
    rows.push(rateRow(`${build.name} tick`, build.tick, 'ticks/s', `${build.tick.perControlPeriod.toFixed(1)} per ${rate} Hz period`));
    const loop = build.closedLoop;
    rows.push([
      `${build.name} closed loop (${loop.simulated_s} s simulated)`,
      ...statsCells(loop),
      `${loop.realTimeFactor.toFixed(1)}× real time`,
      `${(loop.mean_us / (loop.simulated_s * rate)).toFixed(2)} µs/tick${loop.endedEarly ? ' (ended early)' : ''}`,
    ]);
    const overhead = build.protocolOverhead;
    if (overhead) {
      rows.push([
        `${build.name} protocol overhead`,
        duration(overhead.mean_us),
        duration(overhead.p50_us),
        duration(overhead.p99_us),
        '',
        `${overhead.samples}`,
        `compute ${duration(overhead.reportedCompute_mean_us)}`,
        `${((100 * overhead.mean_us * rate) / 1e6).toFixed(1)} % of period`,
      ]);
    }
  }
  const widths = HEADER.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c].length)));
  const line = (cells: string[]) => cells.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join('  ').trimEnd();
  const m = report.machine;
  const out = [
    `footing bench — ${report.scenario.id} (${report.scenario.duration_s} s at ${rate} Hz), ${report.time_ms} ms per task`,
    `machine: ${m.cpuModel}, ${m.cores} cores, Node ${m.nodeVersion}`,
    '',
    line(HEADER),
    widths.map((w) => '─'.repeat(w)).join('  '),
    ...rows.map(line),
  ];
  for (const failure of report.failures) out.push(`not measured: ${failure.name} (${failure.spec}): ${failure.message}`);
  return out;
}
