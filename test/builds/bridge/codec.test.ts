// The wire format: frames survive arbitrary chunking, observations round-trip bit for bit (the
// sign of zero included), and act messages are checked field by field against the robot.

import { Writable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ACT_TAG, F64TickChannel, OBS_TAG, actionDoubles, observationDoubles } from '../../../harness/builds/process/binary.js';
import { createAction } from '../../../harness/builds/interface.js';
import { ActionReader, decodeReady, encodeObservation } from '../../../harness/builds/process/codec.js';
import { TailBuffer } from '../../../harness/builds/process/failure.js';
import { newlineFraming } from '../../../harness/builds/process/framing.js';
import { newObservation, syntheticObservation } from './helpers.js';

function validAct(feet: number, telemetry: number): Record<string, unknown> {
  return {
    type: 'act',
    mode: Array(feet).fill(1),
    groundForce_N: Array(3 * feet).fill(1.5),
    footTarget_m: Array(3 * feet).fill(-0.25),
    footTargetVelocity_mps: Array(3 * feet).fill(0),
    stiffness_N_per_m: Array(feet).fill(100),
    damping_Ns_per_m: Array(feet).fill(3),
    telemetry: Array(telemetry).fill(7),
  };
}

describe('newline framing', () => {
  it('yields the same frames however the byte stream is cut into chunks', () => {
    const lines = ['{"a":1}', '{"b":"ü€"}', '', '{"c":[1,2,3]}\r'];
    const bytes = Buffer.from(lines.map((line) => line + '\n').join(''), 'utf8');
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 1, max: bytes.length - 1 }), { maxLength: 8 }), (cuts) => {
        const decoder = newlineFraming.createDecoder(1024);
        const frames: string[] = [];
        let start = 0;
        for (const cut of [...cuts].sort((a, b) => a - b).concat(bytes.length)) {
          expect(decoder.push(bytes.subarray(start, cut), (frame) => frames.push(frame))).toBeNull();
          start = cut;
        }
        // The trailing \r of a CRLF line is dropped; multi-byte characters split across chunks survive.
        expect(frames).toEqual(['{"a":1}', '{"b":"ü€"}', '', '{"c":[1,2,3]}']);
        expect(decoder.pendingBytes()).toBe(0);
      }),
    );
  });

  it('reports a line longer than the limit instead of buffering without end', () => {
    const decoder = newlineFraming.createDecoder(16);
    expect(decoder.push(Buffer.from('x'.repeat(40)), () => {})).toMatch(/a line of 40 bytes exceeds the limit of 16 bytes/);
  });
});

describe('observation encoding', () => {
  it('writes JSON whose numbers read back to the same doubles, -0 included', () => {
    const obs = newObservation();
    for (let step = 0; step < 50; step++) {
      syntheticObservation(obs, step);
      const message = JSON.parse(encodeObservation(obs, step));
      expect(message.type).toBe('obs');
      expect(message.tick).toBe(step);
      expect(message.time_s).toBe(obs.time_s);
      for (const field of ['trunkPosition_m', 'trunkQuaternion', 'trunkVelocity_mps', 'trunkAngularVelocity_radps', 'footPosition_m', 'footVelocity_mps', 'footForce_N', 'frictionEstimate'] as const) {
        // Object.is distinguishes −0 from +0, so this is bit equality for finite doubles.
        (message[field] as number[]).forEach((value, i) => expect(Object.is(value, obs[field][i])).toBe(true));
      }
      expect(message.footContact).toEqual(Array.from(obs.footContact));
      expect(message.command).toEqual({ gait: 'stand', velocity_mps: [0, 0, 0], yawRate_radps: 0 });
    }
  });

  it('round-trips arbitrary doubles exactly (shortest round-trip formatting)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const obs = newObservation();
        obs.trunkPosition_m[0] = x;
        const back = JSON.parse(encodeObservation(obs, 0)).trunkPosition_m[0];
        expect(Object.is(back, x)).toBe(true);
      }),
    );
  });
});

describe('act decoding', () => {
  const reader = new ActionReader(4, 2);

  function read(message: unknown): ReturnType<ActionReader['read']> {
    return reader.read(typeof message === 'string' ? message : JSON.stringify(message), 5, createAction(4, 2));
  }

  it('copies a valid act into the action and keeps the reported compute time', () => {
    const action = createAction(4, 2);
    const message = { ...validAct(4, 2), tick: 5, compute_us: 12.5 };
    expect(reader.read(JSON.stringify(message), 5, action)).toBeNull();
    expect(Array.from(action.groundForce_N)).toEqual(Array(12).fill(1.5));
    expect(Array.from(action.mode)).toEqual([1, 1, 1, 1]);
    expect(Array.from(action.telemetry)).toEqual([7, 7]);
    expect(reader.reportedCompute_us).toBe(12.5);
    expect(reader.read(JSON.stringify(validAct(4, 2)), 5, action)).toBeNull();
    expect(reader.reportedCompute_us).toBeNaN();
  });

  it('checks every array length against the foot and telemetry counts', () => {
    const act = validAct(4, 2);
    expect(read({ ...act, mode: [1, 1, 1] })?.detail).toMatch(/field mode = \[1,1,1\]: must NOT have fewer than 4 items/);
    expect(read({ ...act, stiffness_N_per_m: Array(5).fill(1) })?.detail).toMatch(/stiffness_N_per_m .*more than 4 items/);
    expect(read({ ...act, telemetry: [1] })?.detail).toMatch(/field telemetry = \[1\]/);
    const { telemetry: _dropped, ...noTelemetry } = act;
    expect(read(noTelemetry)?.detail).toMatch(/must have required property 'telemetry'/);
  });

  it('tells non-finite numbers from other malformed input', () => {
    const act = validAct(4, 2);
    const withNull = JSON.stringify(act).replace('"groundForce_N":[1.5', '"groundForce_N":[null');
    expect(read(withNull)).toEqual({ reason: 'non-finite', detail: expect.stringMatching(/groundForce_N\[0\] = null/) });
    const withNaN = JSON.stringify(act).replace('"groundForce_N":[1.5', '"groundForce_N":[NaN');
    expect(read(withNaN)?.reason).toBe('non-finite');
    const withInfinity = JSON.stringify(act).replace('"groundForce_N":[1.5', '"groundForce_N":[-Infinity');
    expect(read(withInfinity)?.reason).toBe('non-finite');
    // JSON.parse reads 1e999 as Infinity; the schema's "number" refuses it.
    expect(read(JSON.stringify(act).replace('"groundForce_N":[1.5', '"groundForce_N":[1e999'))?.reason).toBe('non-finite');
    expect(read('{"type":"act",')?.reason).toBe('malformed');
    expect(read({ ...act, mode: [1, 2, 1, 1] })?.detail).toMatch(/mode\[1\] = 2: must be equal to one of the allowed values/);
    expect(read({ ...act, extra: 1 })?.detail).toMatch(/must NOT have additional properties \('extra'\)/);
    expect(read({ ...act, type: 'obs' })?.reason).toBe('malformed');
  });

  it('refuses an answer to another tick than the one asked', () => {
    expect(read({ ...validAct(4, 2), tick: 4 })?.detail).toMatch(/answered tick 4 when tick 5 was asked/);
  });
});

describe('ready decoding', () => {
  it('checks the protocol version before the rest of the shape', () => {
    expect(decodeReady('{"type":"ready","protocol":2,"whatever":true}')).toMatchObject({ ok: false, reason: 'protocol-version' });
    expect(decodeReady('{"type":"ready","protocol":1,"telemetryNames":["a","a"]}')).toMatchObject({ ok: false, reason: 'malformed' });
    expect(decodeReady('{"type":"act"}')).toMatchObject({ ok: false, reason: 'malformed', detail: expect.stringMatching(/expected \{"type":"ready"/) });
    expect(decodeReady('{"type":"ready","protocol":1,"telemetryNames":["a.b"]}')).toEqual({
      ok: true,
      message: { type: 'ready', protocol: 1, telemetryNames: ['a.b'] },
    });
  });
});

describe('TailBuffer', () => {
  it('keeps exactly the last bytes written, across many small and one large chunk', () => {
    const tail = new TailBuffer(10);
    let all = '';
    for (let i = 0; i < 30; i++) {
      const piece = `${i},`;
      tail.push(Buffer.from(piece));
      all += piece;
      expect(tail.text()).toBe(all.slice(-10));
    }
    tail.push(Buffer.from('abcdefghijklmnop'));
    expect(tail.text()).toBe('ghijklmnop');
  });
});

describe('f64 frames', () => {
  const FEET = 4;
  const TELEMETRY = 2;

  function capture(): { stream: Writable; frames: Buffer[] } {
    const frames: Buffer[] = [];
    const stream = new Writable({
      write(chunk: Buffer, _encoding, done) {
        frames.push(Buffer.from(chunk));
        done();
      },
    });
    return { stream, frames };
  }

  it('lay out an observation as docs/protocol.md says', () => {
    const channel = new F64TickChannel(FEET, TELEMETRY);
    const obs = newObservation();
    syntheticObservation(obs, 3);
    obs.command.gait = 'trot';
    obs.command.velocity_mps.set([0.5, -0.1, 0]);
    obs.command.yawRate_radps = 0.25;
    const { stream, frames } = capture();
    channel.send(stream, obs, 17, createAction(FEET, TELEMETRY));
    const frame = frames[0];
    expect(frame.length).toBe(8 + 8 * observationDoubles(FEET));
    expect(frame.toString('latin1', 0, 8)).toBe(OBS_TAG);
    const at = (index: number): number => frame.readDoubleLE(8 + 8 * index);
    const n = FEET;
    expect(at(0)).toBe(17);
    expect(at(1)).toBe(obs.time_s);
    expect([at(2), at(3), at(4)]).toEqual(Array.from(obs.trunkPosition_m));
    expect([5, 6, 7, 8].map(at)).toEqual(Array.from(obs.trunkQuaternion));
    expect([12, 13, 14].map(at)).toEqual(Array.from(obs.trunkAngularVelocity_radps));
    expect(at(15 + 3 * n + 1)).toBe(obs.footVelocity_mps[1]);
    expect(at(15 + 6 * n + 2)).toBe(obs.footForce_N[2]);
    expect(at(15 + 9 * n + 3)).toBe(obs.footContact[3]);
    expect(at(15 + 10 * n)).toBe(obs.frictionEstimate[0]);
    expect([15, 16, 17, 18, 19].map((i) => at(i + 11 * n))).toEqual([1, 0.5, -0.1, 0, 0.25]);
  });

  it('read an act frame however it is chunked, and refuse one nobody asked for', () => {
    const channel = new F64TickChannel(FEET, TELEMETRY);
    const action = createAction(FEET, TELEMETRY);
    const values = [5, 42.5, 1, 0, 1, 1, ...Array.from({ length: 9 * FEET + 2 * FEET + TELEMETRY }, (_, i) => i + 0.5)];
    expect(values.length).toBe(actionDoubles(FEET, TELEMETRY));
    const frame = Buffer.alloc(8 + 8 * values.length);
    frame.write(ACT_TAG, 0, 'latin1');
    values.forEach((value, i) => frame.writeDoubleLE(value, 8 + 8 * i));
    channel.send(capture().stream, newObservation(), 5, action);
    const answers: unknown[] = [];
    channel.push(frame.subarray(0, 13), (problem) => answers.push(problem));
    expect(answers).toEqual([]);
    expect(channel.pendingBytes()).toBe(13);
    channel.push(frame.subarray(13), (problem) => answers.push(problem));
    expect(answers).toEqual([null]);
    expect(channel.reportedCompute_us).toBe(42.5);
    expect(Array.from(action.mode)).toEqual([1, 0, 1, 1]);
    expect(action.groundForce_N[0]).toBe(0.5);
    expect(action.footTarget_m[0]).toBe(12.5);
    expect(action.damping_Ns_per_m[3]).toBe(43.5);
    expect(Array.from(action.telemetry)).toEqual([44.5, 45.5]);
    channel.push(frame, (problem) => answers.push(problem));
    expect(answers[1]).toMatchObject({ reason: 'malformed', detail: expect.stringMatching(/sent a frame when none was asked/) });
  });
});
