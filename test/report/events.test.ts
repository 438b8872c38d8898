// The scenario's moments the report marks on its time axes, read from the resolved scenario.
import { describe, expect, it } from 'vitest';
import { scenarioEvents } from '../../harness/scenario/events.js';
import { readFileSync } from 'node:fs';
import { loadRobotText, loadScenarioFile } from '../../harness/scenario/load.js';

async function load(file: string) {
  const loaded = await loadScenarioFile(file);
  if (!loaded.ok) throw new Error(loaded.errors.map((e) => e.message).join('\n'));
  return loaded.scenarios[0];
}

describe('scenario events on the time axes', () => {
  it('marks a pulse push at its start with its force (lateral-push-dry: 100 N half-sine at 4 s for 0.15 s)', async () => {
    const events = scenarioEvents(await load('scenarios/lateral-push-dry.yaml'));
    expect(events.filter((e) => e.kind === 'push')).toEqual([{ t_s: 4, kind: 'push', text: 'push 100 N for 150 ms' }]);
  });

  it('marks every command change after t = 0 (wet-start-stop: trot at 1 s, stand at 3.5 s, trot at 5 s, stand at 7.5 s)', async () => {
    const events = scenarioEvents(await load('scenarios/wet-start-stop.yaml'));
    const commands = events.filter((e) => e.kind === 'command');
    expect(commands.map((e) => e.t_s)).toEqual([1, 3.5, 5, 7.5]);
    expect(commands[0].text).toContain('trot, v = (0.5, 0) m/s');
  });

  it('carries the robot file\'s leg names in hips_m order', async () => {
    const scenario = await load('scenarios/lateral-push-dry.yaml');
    expect(scenario.plant.robot.legNames).toEqual(['FL', 'FR', 'HL', 'HR']);
  });

  it('refuses leg names that do not match the hips one to one, naming the file and path', () => {
    const text = readFileSync('scenarios/robots/quad-24kg.yaml', 'utf8').replace('legNames: [FL, FR, HL, HR]', 'legNames: [FL, FR, HL]');
    const loaded = loadRobotText(text, 'scenarios/robots/three-names.yaml');
    expect(loaded.ok).toBe(false);
    const message = loaded.ok ? '' : loaded.errors.map((e) => `${e.file} ${e.path}: ${e.message}`).join('\n');
    expect(message).toContain('three-names.yaml');
    expect(message).toMatch(/\/legNames: gives 3 leg names for 4 hips/);
  });
});
