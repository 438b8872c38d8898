// Type guards for checks that run on data which may still be partly invalid: every physical
// check looks only at the values that have the right shape, so one bad field never hides others.

import { isRecord } from '../files/source.js';

export { isRecord };

export function num(v: unknown): number | undefined {
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
}

export function vec(v: unknown, n: number): number[] | undefined {
  return Array.isArray(v) && v.length === n && v.every((x) => num(x) !== undefined) ? (v as number[]) : undefined;
}

export function rec(v: unknown): Record<string, unknown> | undefined {
  return isRecord(v) ? v : undefined;
}

export function list(v: unknown): unknown[] | undefined {
  return Array.isArray(v) ? v : undefined;
}
