// Linear scales and "nice" tick values (1, 2, 5 × 10^k steps, the usual choice for axis labels;
// common practice in plotting libraries).

export type Scale = (value: number) => number;

export function linearScale(domain0: number, domain1: number, range0: number, range1: number): Scale {
  const span = domain1 - domain0;
  const k = span === 0 ? 0 : (range1 - range0) / span;
  return (value: number) => range0 + (value - domain0) * k;
}

export function niceStep(span: number, count: number): number {
  if (!(span > 0) || !(count > 0)) return 1;
  const raw = span / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const unit = raw / power;
  return (unit >= 5 ? 10 : unit >= 2 ? 5 : unit >= 1 ? 2 : 1) * power;
}

/** Tick values within [lo, hi] on a nice step, about `count` of them. */
export function niceTicks(lo: number, hi: number, count: number): number[] {
  if (!(hi > lo)) return [lo];
  const step = niceStep(hi - lo, count);
  const ticks: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));
  return ticks;
}

/** Upper end of a domain rounded up to a nice step (for force axes and the like). */
export function niceCeil(value: number, count = 4): number {
  if (!(value > 0)) return 1;
  const step = niceStep(value, count);
  return Math.ceil(value / step - 1e-9) * step;
}
