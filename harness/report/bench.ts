// Bench figures (#7) for the report, read leniently: the bench JSON may come as an array of build
// entries or an object keyed by build name; per build the governor's rate sits under
// `governor.updatesPerSecond`, the tick rate as `ticksPerSecond`, plus `realTimeFactor`. Anything
// absent reads as "not measured".

export interface BenchRow {
  build: string;
  /** Formatted figures ('' when not measured). */
  governorUpdatesPerSecond: string;
  ticksPerSecond: string;
  realTimeFactor: string;
}

/** Thousands grouped with thin spaces (SI style), at most 3 significant decimals below 100. */
export function formatRate(value: number | null): string {
  if (value === null) return '';
  const rounded = value >= 100 ? Math.round(value) : Number(value.toPrecision(3));
  const [whole, fraction] = String(rounded).split('.');
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
  return fraction ? `${grouped}.${fraction}` : grouped;
}

export interface BenchView {
  measured: boolean;
  rows: BenchRow[];
  machine: string | null;
}

const finite = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const record = (v: unknown): Record<string, unknown> | null => (v !== null && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : null);

export function benchView(bench: unknown): BenchView {
  const root = record(bench);
  const list = Array.isArray(bench) ? bench : root ? (root.builds ?? root.results ?? null) : null;
  const entries: [string, Record<string, unknown>][] = [];
  if (Array.isArray(list)) {
    for (const item of list) {
      const r = record(item);
      const name = r && (typeof r.name === 'string' ? r.name : typeof r.build === 'string' ? r.build : null);
      if (r && name) entries.push([name, r]);
    }
  } else if (record(list)) {
    for (const [name, item] of Object.entries(list as Record<string, unknown>)) {
      const r = record(item);
      if (r) entries.push([name, r]);
    }
  }
  const rows = entries.map(([build, r]) => {
    const governor = record(r.governor);
    const tick = record(r.tick);
    return {
      build,
      governorUpdatesPerSecond: formatRate(finite(governor?.updatesPerSecond)),
      ticksPerSecond: formatRate(finite(r.ticksPerSecond) ?? finite(tick?.ticksPerSecond)),
      realTimeFactor: formatRate(finite(r.realTimeFactor) ?? finite(record(r.closedLoop)?.realTimeFactor)),
    };
  });
  const machine = root && record(root.machine) ? describeMachine(record(root.machine) as Record<string, unknown>) : null;
  return { measured: rows.some((r) => r.governorUpdatesPerSecond !== '' || r.ticksPerSecond !== '' || r.realTimeFactor !== ''), rows, machine };
}

function describeMachine(m: Record<string, unknown>): string {
  return [m.cpuModel, m.cores !== undefined ? `${String(m.cores)} cores` : null, m.nodeVersion ? `Node ${String(m.nodeVersion)}` : null].filter(Boolean).join(', ');
}
