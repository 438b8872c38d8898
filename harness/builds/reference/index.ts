// The bundled reference builds, each a ControllerFactory (harness/builds/interface.ts), looked up
// by id from build specs such as `ref:governed`.

import type { ControllerFactory } from '../interface.js';
import type { ReferenceBuildId } from '../spec.js';
import { ReferenceController, type Variant } from './controller.js';

/** How much the demo-only over-trusting build inflates the friction estimate. */
export const OVERTRUST_FACTOR = 1.6;

// Keyed by the ids of builds/spec.ts (the one list of ids): the compiler checks each has a variant.
const VARIANTS: Record<ReferenceBuildId, Variant> = {
  nominal: { id: 'nominal', governed: false, post: 'none' },
  governed: { id: 'governed', governed: true, post: 'none' },
  clamped: { id: 'clamped', governed: false, post: 'clamp' },
  qp: { id: 'qp', governed: false, post: 'qp' },
  overtrusting: { id: 'overtrusting', governed: true, post: 'none', defaults: { frictionTrust: OVERTRUST_FACTOR } },
};

function factory(variant: Variant): ControllerFactory {
  return (setup) => new ReferenceController(setup, variant);
}

export const referenceBuilds: Readonly<Record<string, ControllerFactory>> = {
  nominal: factory(VARIANTS.nominal),
  governed: factory(VARIANTS.governed),
  clamped: factory(VARIANTS.clamped),
  qp: factory(VARIANTS.qp),
  overtrusting: factory(VARIANTS.overtrusting),
} satisfies Record<ReferenceBuildId, ControllerFactory>;

export { ReferenceController } from './controller.js';
export { ExplicitReferenceGovernor } from './erg.js';
export { TrunkGovernor } from './governor.js';
