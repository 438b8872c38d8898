// The scenario's own moments on the report's time axes: each push (start time and peak force) and
// each command change after t = 0 (gait and commanded velocity). Falls are per run (report
// model.ts, from the scorer's fellAt_s). Text here is ours, built from numbers and gait names.
// Written into every run's series file too, so a report re-rendered from saved results (`footing
// report`, `footing merge`) marks them without the scenario files.

import { label } from '../files/numberText.js';
import type { ResolvedScenario } from './types.js';

export interface ScenarioEvent {
  t_s: number;
  kind: 'push' | 'command';
  text: string;
}

const magnitude = (f: readonly number[]) => Math.hypot(f[0], f[1], f[2]);

export function scenarioEvents(scenario: ResolvedScenario): ScenarioEvent[] {
  const out: ScenarioEvent[] = [];
  for (const push of scenario.plant.pushes) {
    if (push.kind === 'pulse') {
      out.push({ t_s: push.at_s, kind: 'push', text: `push ${label(magnitude(push.force_N), 0)} N for ${label(push.duration_s * 1000, 0)} ms` });
    } else if (push.kind === 'series' && push.t_s.length > 0) {
      let peak = 0;
      for (const f of push.force_N) peak = Math.max(peak, magnitude(f));
      out.push({ t_s: push.t_s[0], kind: 'push', text: `recorded push, peak ${label(peak, 0)} N, until ${label(push.t_s[push.t_s.length - 1], 2)} s` });
    }
  }
  for (const c of scenario.commands) {
    if (!(c.at_s > 0)) continue;
    out.push({
      t_s: c.at_s,
      kind: 'command',
      text: `command: ${c.gait}, v = (${label(c.velocity_mps[0], 2)}, ${label(c.velocity_mps[1], 2)}) m/s, yaw ${label(c.yawRate_radps, 2)} rad/s`,
    });
  }
  return out;
}
