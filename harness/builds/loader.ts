// Opens a build from its spec: imports an in-process module, looks up a reference build, or
// spawns a process build; all three come back behind one interface (OpenedBuild) that measures
// each tick and turns every build misbehaviour into a BuildFailure.
//
// The episode loop's use:
//   const build = await openBuild(spec, setup);                  // BuildFailure | BuildSpecError
//   const action = createAction(footCount, build.telemetryNames.length);
//   try { for (…) { const pending = build.tick(obs, action); if (pending) await pending;
//                   sample.loopTime_us = build.loopTime_us;
//                   sample.reportedCompute_us = build.reportedCompute_us; } }
//   finally { await build.close(); }

import { existsSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import type { Action, Controller, ControllerFactory, ControllerSetup, Observation } from './interface.js';
import { openProcessBuild, type ProcessBuildOptions } from './process/bridge.js';
import { BuildFailure } from './process/failure.js';
import { BuildSpecError, REFERENCE_BUILD_IDS, type BuildKind, type BuildSpec } from './spec.js';
import { checkActionModes } from './modes.js';
import { openIsolatedModule } from './isolated/open.js';
import { checkActionFinite, type OpenedBuild } from './opened.js';

export { checkActionFinite, type OpenedBuild } from './opened.js';

export { BuildFailure, BUILD_FAILURE_REASONS, type BuildFailureReason } from './process/failure.js';

export interface OpenBuildOptions extends ProcessBuildOptions {
  /** Replaces the bundled registry harness/builds/reference/index.ts (tests, plug-ins). */
  referenceBuilds?: Record<string, ControllerFactory>;
  /** 'thread': a module build runs in a thread of its own, out of reach of the caller's (isolated/open.ts). */
  isolation?: 'thread';
}


export async function openBuild(
  spec: BuildSpec,
  setup: ControllerSetup,
  options: OpenBuildOptions = {},
): Promise<OpenedBuild> {
  const merged: ControllerSetup = { ...setup, options: { ...setup.options, ...spec.options } };
  switch (spec.kind) {
    case 'process': {
      const program = { name: spec.name, program: spec.entry, args: spec.args, cwd: spec.cwd };
      return await openProcessBuild(program, merged, options);
    }
    case 'module': {
      if (options.isolation === 'thread') return await openIsolatedModule(spec, merged);
      const factory = await loadModuleFactory(spec);
      return guardController(await createGuarded(spec, factory, merged), spec.name, 'module');
    }
    case 'reference': {
      const registry = options.referenceBuilds ?? (await loadReferenceRegistry(spec));
      const factory = registry[spec.entry];
      if (typeof factory !== 'function') {
        throw new BuildSpecError(
          spec.text,
          `reference build '${spec.entry}' is not in the registry (it has ${Object.keys(registry).join(', ') || 'nothing'})`,
        );
      }
      return guardController(await createGuarded(spec, factory, merged), spec.name, 'reference');
    }
  }
}

/** Imports the module of a module build and returns its `createController` (or default) export. */
export async function loadModuleFactory(spec: BuildSpec): Promise<ControllerFactory> {
  if (!existsSync(spec.entry)) throw new BuildSpecError(spec.text, `module file ${spec.entry} does not exist`);
  let exports: Record<string, unknown>;
  try {
    exports = await importFile(spec.entry);
  } catch (error) {
    throw new BuildFailure('threw', `build '${spec.name}': loading ${spec.entry} failed: ${errorText(error)}`, '', {
      cause: error,
    });
  }
  const factory = exports.createController ?? exports.default;
  if (typeof factory !== 'function') {
    throw new BuildFailure(
      'malformed',
      `build '${spec.name}': ${spec.entry} must export a function createController(setup) (or a default export); ` +
        `it exports ${Object.keys(exports).join(', ') || 'nothing'}`,
    );
  }
  return factory as ControllerFactory;
}

/** TypeScript build modules: .ts follows the nearest package.json's "type", .mts is ESM, .cts CommonJS. */
const TYPESCRIPT_MODULE = /\.[mc]?ts$/;

async function importFile(path: string): Promise<Record<string, unknown>> {
  const url = pathToFileURL(path).href;
  // tsImport compiles TypeScript through both of Node's loaders: a plain `import` with only the
  // ESM hooks registered hands a .ts in a CommonJS package to the CommonJS loader untransformed
  // ("Unexpected identifier", or "Cannot require() ES Module … in a cycle"). It also works in a
  // worker thread, which does not inherit the hooks of the thread that started it.
  if (TYPESCRIPT_MODULE.test(path)) {
    const { tsImport } = await import('tsx/esm/api');
    return (await tsImport(url, import.meta.url)) as Record<string, unknown>;
  }
  return (await import(url)) as Record<string, unknown>;
}

async function loadReferenceRegistry(spec: BuildSpec): Promise<Record<string, ControllerFactory>> {
  // A variable specifier keeps the type checker from requiring the registry at compile time:
  // it is written separately and may not exist in every checkout.
  const specifier = './reference/index.js';
  let registry: unknown;
  try {
    registry = ((await import(specifier)) as { referenceBuilds?: unknown }).referenceBuilds;
  } catch (error) {
    throw new BuildSpecError(
      spec.text,
      `the reference builds (${REFERENCE_BUILD_IDS.join(', ')}) could not be loaded from harness/builds/reference/index.ts: ${errorText(error)}`,
    );
  }
  if (registry === null || typeof registry !== 'object') {
    throw new BuildSpecError(spec.text, 'harness/builds/reference/index.ts does not export referenceBuilds');
  }
  return registry as Record<string, ControllerFactory>;
}

async function createGuarded(spec: BuildSpec, factory: ControllerFactory, setup: ControllerSetup): Promise<Controller> {
  let controller: Controller;
  try {
    controller = await factory(setup);
  } catch (error) {
    throw new BuildFailure('threw', `build '${spec.name}': its factory threw: ${errorText(error)}`, '', { cause: error });
  }
  if (controller === null || typeof controller !== 'object' || typeof controller.tick !== 'function') {
    throw new BuildFailure('malformed', `build '${spec.name}': the factory must return an object with a tick(obs, action) method`);
  }
  const names: unknown = controller.telemetryNames;
  if (!Array.isArray(names) || names.some((name) => typeof name !== 'string' || name === '')) {
    throw new BuildFailure('malformed', `build '${spec.name}': telemetryNames must be an array of non-empty strings`);
  }
  if (new Set(names).size !== names.length) {
    throw new BuildFailure('malformed', `build '${spec.name}': telemetryNames has duplicates`);
  }
  return controller;
}


/**
 * Wraps an in-process controller: times each tick (performance.now(): a double, where
 * process.hrtime.bigint() allocated two BigInts per tick), turns a throw into
 * BuildFailure('threw') and a non-finite action into BuildFailure('non-finite'). A synchronous
 * controller stays synchronous (no promise per tick).
 */
export function guardController(controller: Controller, name: string, kind: BuildKind = 'module'): OpenedBuild {
  return new GuardedController(controller, name, kind);
}

class GuardedController implements OpenedBuild {
  readonly telemetryNames: readonly string[];
  loopTime_us = Number.NaN;
  readonly reportedCompute_us = Number.NaN;
  readonly about = '';
  governorUpdate?: (obs: Observation) => void;
  private tickCount = 0;
  private start_ms = 0;
  private closed = false;

  constructor(
    private readonly inner: Controller,
    readonly name: string,
    readonly kind: BuildKind,
  ) {
    this.telemetryNames = Object.freeze([...inner.telemetryNames]);
    if (typeof inner.governorUpdate === 'function') {
      this.governorUpdate = (obs) => (inner.governorUpdate as (obs: Observation) => void).call(inner, obs);
    }
  }

  tick(obs: Observation, action: Action): void | Promise<void> {
    this.start_ms = performance.now();
    let pending: void | Promise<void>;
    try {
      pending = this.inner.tick(obs, action);
    } catch (error) {
      throw this.threw(error);
    }
    if (pending !== undefined && typeof (pending as Promise<void>).then === 'function') {
      return (pending as Promise<void>).then(
        () => this.finish(action),
        (error: unknown) => {
          throw this.threw(error);
        },
      );
    }
    this.finish(action);
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    try {
      await this.inner.close?.();
    } catch (error) {
      throw new BuildFailure('threw', `build '${this.name}': close() threw: ${errorText(error)}`, '', { cause: error });
    }
  }

  private finish(action: Action): void {
    this.loopTime_us = (performance.now() - this.start_ms) * 1000;
    const problem = checkActionFinite(action);
    if (problem !== null) {
      throw new BuildFailure('non-finite', `build '${this.name}' at tick ${this.tickCount}: ${problem}`);
    }
    const modes = checkActionModes(action, action.stiffness_N_per_m.length);
    if (modes !== null) throw new BuildFailure(modes.reason, `build '${this.name}' at tick ${this.tickCount}: ${modes.detail}`);
    this.tickCount++;
  }

  private threw(error: unknown): BuildFailure {
    if (error instanceof BuildFailure) return error;
    return new BuildFailure('threw', `build '${this.name}' at tick ${this.tickCount}: ${errorText(error)}`, '', {
      cause: error,
    });
  }
}

function errorText(error: unknown): string {
  if (error instanceof Error) {
    // The first frames of the stack say where in the build it happened.
    const frames = (error.stack ?? '').split('\n').slice(1, 4).map((line) => line.trim()).join(' | ');
    return frames === '' ? error.message : `${error.message} (${frames})`;
  }
  return String(error);
}
