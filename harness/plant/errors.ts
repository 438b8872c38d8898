// Errors the plant raises. Both carry enough to point a person at the cause without a debugger.

/** A robot, ground or physics parameter that makes no physical sense. */
export class PlantConfigError extends Error {
  constructor(
    readonly field: string,
    readonly value: unknown,
    readonly expected: string,
  ) {
    super(`plant parameter ${field} = ${formatValue(value)}: expected ${expected}`);
    this.name = 'PlantConfigError';
  }
}

/** The integration produced a non-finite state; the run stops at that step. */
export class PlantDivergedError extends Error {
  constructor(
    readonly time_s: number,
    readonly quantity: string,
  ) {
    super(`simulation diverged at t = ${time_s.toFixed(6)} s: ${quantity} is not finite`);
    this.name = 'PlantDivergedError';
  }
}

function formatValue(value: unknown): string {
  if (typeof value === 'number') return String(value);
  try {
    return JSON.stringify(value) ?? String(value);
  } catch {
    return String(value);
  }
}
