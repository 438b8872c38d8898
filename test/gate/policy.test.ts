import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEFAULT_GATE_RULES, GATE_RULE_NAMES, rulesFor } from '../../harness/gate/defaults.js';
import { loadPolicy, parsePolicy, POLICY_SCHEMA_URL, PolicyError } from '../../harness/gate/policy.js';

function issues(text: string): string[] {
  try {
    parsePolicy(text, 'gate-policy.yaml');
  } catch (error) {
    expect(error).toBeInstanceOf(PolicyError);
    return (error as Error).message.split('\n');
  }
  throw new Error('expected a PolicyError');
}

describe('gate policy', () => {
  it('is the defaults when the file is empty', () => {
    expect(parsePolicy('', 'p.yaml').rules).toEqual(DEFAULT_GATE_RULES);
    expect(parsePolicy('# nothing but a comment\n', 'p.yaml').rules).toEqual(DEFAULT_GATE_RULES);
  });

  it('fills unspecified rules with defaults and applies overrides by scenario id', () => {
    const policy = parsePolicy('frictionMarginMinLoss: 0.05\noverrides:\n  ice-walk:\n    allowNewFalls: true\n', 'p.yaml');
    expect(policy.rules).toEqual({ ...DEFAULT_GATE_RULES, frictionMarginMinLoss: 0.05 });
    expect(rulesFor(policy, 'ice-walk')).toEqual({ ...DEFAULT_GATE_RULES, frictionMarginMinLoss: 0.05, allowNewFalls: true });
    expect(rulesFor(policy, 'quiet-stand').allowNewFalls).toBe(false);
  });

  it('names file, line, column, path, value and expectation for each problem, in line order', () => {
    expect(
      issues(
        [
          'frictionMarginMinLos: 0.05', // line 1: misspelt
          'slipDistanceGrowthFraction: -0.2', // line 2: negative
          'overrides:',
          '  ice-walk:',
          '    allowNewFalls: "no"', // line 5: not a boolean
          '    governorRateDrop: 1.5', // line 6: above 1
          'version: 2', // line 7
        ].join('\n'),
      ),
    ).toEqual([
      'gate-policy.yaml:1:1: frictionMarginMinLos: unknown key; did you mean "frictionMarginMinLoss"?',
      'gate-policy.yaml:2:29: slipDistanceGrowthFraction: -0.2: expected a number ≥ 0',
      'gate-policy.yaml:5:20: overrides.ice-walk.allowNewFalls: "no": expected true or false, or null to switch the rule off',
      'gate-policy.yaml:6:23: overrides.ice-walk.governorRateDrop: 1.5: expected a number ≤ 1',
      'gate-policy.yaml:7:10: version: 2: expected 1',
    ]);
  });

  it('accepts null for every rule (the rule is then off)', () => {
    const text = GATE_RULE_NAMES.filter((name) => name !== 'familyConfidence').map((name) => `${name}: null`).join('\n');
    const policy = parsePolicy(text, 'p.yaml');
    for (const name of GATE_RULE_NAMES) if (name !== 'familyConfidence') expect(policy.rules[name]).toBeNull();
  });

  it('offers no guess for a key unlike any rule', () => {
    expect(issues('colour: blue\n')).toEqual(['gate-policy.yaml:1:1: colour: unknown key']);
  });

  it('reports YAML syntax errors and duplicate keys with their line', () => {
    expect(issues('allowNewFalls: false\nallowNewFalls: true\n')[0]).toMatch(/^gate-policy\.yaml:2:1: \(top level\): YAML: Map keys must be unique/);
    expect(issues('overrides: [1\n')[0]).toMatch(/^gate-policy\.yaml:2:\d+: \(top level\): YAML: /);
    expect(issues('- 1\n- 2\n')).toEqual(['gate-policy.yaml:1:1: (top level): [1,2]: expected a mapping (key: value lines)']);
  });

  it('reports an unreadable file by name', () => {
    expect(() => loadPolicy('/nonexistent/gate-policy.yaml')).toThrow('/nonexistent/gate-policy.yaml: (top level): cannot read the policy file (ENOENT)');
  });

  it('has a schema naming exactly the rules of defaults.ts', () => {
    const schema = JSON.parse(readFileSync(POLICY_SCHEMA_URL, 'utf8'));
    expect(Object.keys(schema.$defs.rules.properties).sort()).toEqual([...GATE_RULE_NAMES].sort());
    expect(Object.keys(DEFAULT_GATE_RULES).sort()).toEqual([...GATE_RULE_NAMES].sort());
  });

  it('matches the complete example policy written out in docs/scoring.md', () => {
    const docs = readFileSync(new URL('../../docs/scoring.md', import.meta.url), 'utf8');
    const block = /<!-- default-policy -->\s*```yaml\n([\s\S]*?)```/.exec(docs);
    expect(block, 'docs/scoring.md must hold the default policy in a ```yaml block after <!-- default-policy -->').not.toBeNull();
    const policy = parsePolicy(block![1], 'docs/scoring.md');
    expect(policy.rules).toEqual(DEFAULT_GATE_RULES);
    for (const name of GATE_RULE_NAMES) expect(block![1]).toMatch(new RegExp(`^${name}:`, 'm'));
  });
});
