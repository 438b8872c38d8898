#!/usr/bin/env python3
"""A standing controller that speaks Footing's build protocol, version 1 (docs/protocol.md).

Run it as a process build:
    footing run … --build 'stand=exec:python3 examples/python/stand_controller.py'

Standard library only. Every foot is in stance. The wanted ground force on each foot is an even
share of the total weight along -gravity plus an even share of a PD force on trunk height (and a
damper on horizontal velocity), plus the foot's part of a PD torque on trunk attitude spread over
the feet by lever arm; the legs hold a small impedance toward the standing foot position below
each hip. examples/typescript/stand_controller.ts is the same logic as an in-process module, with
the same floating-point operations in the same order, so the two produce the same actions.

The handshake is a line of JSON each way. For the ticks the harness offers encodings and this
build picks one: "f64" (fixed binary frames of little-endian doubles, the fast path, default) or
"json" (one line of JSON per message; choose it with the build option ?encoding=json). Logs go to
stderr: stdout carries only protocol.

Waiting for the next message: for FOOTING_SPIN_US microseconds (set by the harness; 0 or unset:
never) stdin is polled without blocking, then the wait sleeps in select(). On an idle machine this
saves the ~30 µs an idle core takes to wake, at the price of a busy core while polling
(docs/protocol.md, "Latency on idle machines"). Run with FOOTING_SPIN_US=0 to turn it off.
"""

import json
import math
import os
import select
import struct
import sys
import time

PROTOCOL_VERSION = 1

SPIN_ENV = "FOOTING_SPIN_US"
READ_BYTES = 65536  # a Linux pipe's default capacity (pipe(7))

TELEMETRY_NAMES = ["stand.heightError_m", "stand.tiltError"]


def option(options, key, default):
    value = options.get(key, default)
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ValueError("option %s = %r: expected a number" % (key, value))
    return float(value)


class StandController:
    def __init__(self, hello):
        robot = hello["robot"]
        options = hello.get("options", {})
        self.feet = int(hello["footCount"])
        n = self.feet
        self.mass_kg = robot["trunk"]["mass_kg"] + n * robot["foot"]["mass_kg"]
        g = [float(c) for c in hello["gravity_mps2"]]
        self.gravity = g
        g_norm = math.sqrt(g[0] * g[0] + g[1] * g[1] + g[2] * g[2])
        self.up = [-g[0] / g_norm, -g[1] / g_norm, -g[2] / g_norm]
        self.height_m = float(robot["standingHeight_m"])
        inertia = robot["trunk"]["inertia_kgm2"]
        inertia_kgm2 = (inertia[0][0] + inertia[1][1]) / 2

        # Second-order targets: natural frequency w and damping ratio zeta give k = M w^2 and
        # d = 2 zeta M w (common practice for PD tuning on a rigid body).
        height_w = 2 * math.pi * option(options, "heightFrequency_Hz", 3.0)
        attitude_w = 2 * math.pi * option(options, "attitudeFrequency_Hz", 3.0)
        zeta = option(options, "dampingRatio", 1.0)
        self.height_kp = self.mass_kg * height_w * height_w
        self.height_kd = 2 * zeta * self.mass_kg * height_w
        self.attitude_kp = inertia_kgm2 * attitude_w * attitude_w
        self.attitude_kd = 2 * zeta * inertia_kgm2 * attitude_w
        self.horizontal_kd = option(options, "horizontalDamping_per_s", 2.0) * self.mass_kg
        self.leg_stiffness = option(options, "legStiffness_N_per_m", 200.0)
        self.leg_damping = option(options, "legDamping_Ns_per_m", 5.0)

        # Standing foot position below each hip (trunk frame, relative to the hip).
        self.foot_target = []
        for hip in robot["hips_m"]:
            self.foot_target.extend([0.0, 0.0, -(self.height_m + hip[2])])

    def tick(self, obs):
        n = self.feet
        p = obs["trunkPosition_m"]
        v = obs["trunkVelocity_mps"]
        qw, qx, qy, qz = obs["trunkQuaternion"]
        wb = obs["trunkAngularVelocity_radps"]
        feet = obs["footPosition_m"]
        up = self.up
        g = self.gravity
        m = self.mass_kg

        # Rotation trunk -> world from the unit quaternion (w, x, y, z).
        r00 = 1 - 2 * (qy * qy + qz * qz)
        r01 = 2 * (qx * qy - qw * qz)
        r02 = 2 * (qx * qz + qw * qy)
        r10 = 2 * (qx * qy + qw * qz)
        r11 = 1 - 2 * (qx * qx + qz * qz)
        r12 = 2 * (qy * qz - qw * qx)
        r20 = 2 * (qx * qz - qw * qy)
        r21 = 2 * (qy * qz + qw * qx)
        r22 = 1 - 2 * (qx * qx + qy * qy)
        wx = r00 * wb[0] + r01 * wb[1] + r02 * wb[2]
        wy = r10 * wb[0] + r11 * wb[1] + r12 * wb[2]
        wz = r20 * wb[0] + r21 * wb[1] + r22 * wb[2]

        # Tilt error: the rotation axis that brings the trunk's z axis onto "up", scaled by sin(tilt).
        ex = r12 * up[2] - r22 * up[1]
        ey = r22 * up[0] - r02 * up[2]
        ez = r02 * up[1] - r12 * up[0]
        tx = self.attitude_kp * ex - self.attitude_kd * wx
        ty = self.attitude_kp * ey - self.attitude_kd * wy
        tz = self.attitude_kp * ez - self.attitude_kd * wz

        height_error = self.height_m - p[2]
        fx = -m * g[0] - self.horizontal_kd * v[0]
        fy = -m * g[1] - self.horizontal_kd * v[1]
        fz = -m * g[2] + (self.height_kp * height_error - self.height_kd * v[2])

        lever_sum = 0.0
        for i in range(n):
            rx = feet[3 * i] - p[0]
            ry = feet[3 * i + 1] - p[1]
            rz = feet[3 * i + 2] - p[2]
            lever_sum += rx * rx + ry * ry + rz * rz

        force = [0.0] * (3 * n)
        for i in range(n):
            rx = feet[3 * i] - p[0]
            ry = feet[3 * i + 1] - p[1]
            rz = feet[3 * i + 2] - p[2]
            force[3 * i] = fx / n + (ty * rz - tz * ry) / lever_sum
            force[3 * i + 1] = fy / n + (tz * rx - tx * rz) / lever_sum
            force[3 * i + 2] = fz / n + (tx * ry - ty * rx) / lever_sum

        return {
            "type": "act",
            "tick": obs["tick"],
            "mode": [1] * n,
            "groundForce_N": force,
            "footTarget_m": self.foot_target,
            "footTargetVelocity_mps": [0.0] * (3 * n),
            "stiffness_N_per_m": [self.leg_stiffness] * n,
            "damping_Ns_per_m": [self.leg_damping] * n,
            "telemetry": [height_error, math.sqrt(ex * ex + ey * ey + ez * ez)],
        }


def send(stream, message):
    # allow_nan=False: NaN is not JSON; raising here beats sending a line the harness must reject.
    # json.dumps writes floats with repr(), the shortest text that reads back to the same double.
    stream.write(json.dumps(message, separators=(",", ":"), allow_nan=False))
    stream.write("\n")
    stream.flush()


def decode_f64_observation(values, n):
    """The doubles of an f64 obs frame (after its tag) as the fields of a JSON obs message."""
    k = 15
    obs = {
        "tick": values[0],
        "time_s": values[1],
        "trunkPosition_m": values[2:5],
        "trunkQuaternion": values[5:9],
        "trunkVelocity_mps": values[9:12],
        "trunkAngularVelocity_radps": values[12:15],
        "footPosition_m": values[k:k + 3 * n],
        "footVelocity_mps": values[k + 3 * n:k + 6 * n],
        "footForce_N": values[k + 6 * n:k + 9 * n],
        "footContact": values[k + 9 * n:k + 10 * n],
        "frictionEstimate": values[k + 10 * n:k + 11 * n],
    }
    k += 11 * n
    obs["command"] = {"gait": ("stand", "trot")[int(values[k])], "velocity_mps": values[k + 1:k + 4],
                      "yawRate_radps": values[k + 4]}
    return obs


class SpinPacing:
    """The harness's miss rule (harness/builds/process/spin.ts): in each block of 128 spins three
    may miss; a fourth pauses the spin for 256, 512 ... 4096 waits, a good block resets the
    pause. A machine too busy to run both sides at once soon gets plain sleeping waits back."""

    BLOCK = 128
    MISSES_PER_BLOCK = 3
    MAX_PAUSE_DOUBLINGS = 5

    def __init__(self):
        self.skip = 0
        self.block_spins = 0
        self.block_misses = 0
        self.pauses = 0

    def wanted(self):
        if self.skip > 0:
            self.skip -= 1
            return False
        return True

    def record(self, seen):
        self.block_spins += 1
        if not seen:
            self.block_misses += 1
        if self.block_misses > self.MISSES_PER_BLOCK:
            self.pauses += 1
            self.skip = self.BLOCK << min(self.pauses, self.MAX_PAUSE_DOUBLINGS)
            self.block_spins = self.block_misses = 0
        elif self.block_spins == self.BLOCK:
            self.pauses = self.block_spins = self.block_misses = 0


class StdinReader:
    """Reads stdin's descriptor directly (no Python buffer in between, so nothing read ahead hides
    from select()): lines for the handshake and the json encoding, exact frames for f64."""

    def __init__(self, fd, spin_us):
        self.fd = fd
        self.spin_ns = int(spin_us * 1000)
        self.pacing = SpinPacing()
        self.pending = bytearray()  # bytes read past the last line
        self.chunk = bytearray(READ_BYTES)
        self.chunk_view = memoryview(self.chunk)
        if self.spin_ns > 0:
            os.set_blocking(fd, False)

    def close(self):
        if self.spin_ns > 0:
            os.set_blocking(self.fd, True)  # the descriptor may be shared with whoever started us

    def read_into(self, view):
        """Reads at least one byte into view; 0 at end of input."""
        if self.spin_ns == 0:
            return os.readv(self.fd, [view])
        try:
            return os.readv(self.fd, [view])
        except BlockingIOError:
            pass
        if self.pacing.wanted():
            deadline_ns = time.perf_counter_ns() + self.spin_ns
            while time.perf_counter_ns() < deadline_ns:
                try:
                    got = os.readv(self.fd, [view])
                    self.pacing.record(True)
                    return got
                except BlockingIOError:
                    pass
            self.pacing.record(False)
        while True:
            select.select([self.fd], [], [])
            try:
                return os.readv(self.fd, [view])
            except BlockingIOError:
                pass  # woken without data (another reader, a spurious wake-up): wait again

    def readline(self):
        """The next line with its newline (b"" at end of input; a last line without one as is)."""
        while True:
            end = self.pending.find(b"\n")
            if end >= 0:
                line = bytes(self.pending[:end + 1])
                del self.pending[:end + 1]
                return line
            got = self.read_into(self.chunk_view)
            if not got:
                line = bytes(self.pending)
                self.pending.clear()
                return line
            self.pending += self.chunk_view[:got]

    def read_exactly(self, view):
        """Fills the preallocated view; False at end of input."""
        got = min(len(self.pending), len(view))
        if got:
            view[:got] = self.pending[:got]
            del self.pending[:got]
        while got < len(view):
            k = self.read_into(view[got:])
            if not k:
                return False
            got += k
        return True


def spin_us_from_environment():
    text = os.environ.get(SPIN_ENV, "0")
    try:
        value = float(text)
    except ValueError:
        value = -1.0
    if not (0 <= value <= 10000):
        raise ValueError("%s = %r: expected microseconds from 0 (never spin) to 10000" % (SPIN_ENV, text))
    return value


def run_json(stdin, stdout, controller):
    while True:
        line = stdin.readline()
        if not line:
            return 0  # the harness closed our stdin
        message = json.loads(line)
        kind = message.get("type")
        if kind == "bye":
            return 0
        if kind != "obs":
            sys.stderr.write("stand_controller: unexpected message %r\n" % (kind,))
            return 2
        start_ns = time.perf_counter_ns()
        action = controller.tick(message)
        action["compute_us"] = (time.perf_counter_ns() - start_ns) / 1000
        send(stdout, action)


def write_all(fd, view):
    """Writes the whole frame straight to the file descriptor (no buffer, no flush)."""
    sent = 0
    while sent < len(view):
        sent += os.write(fd, view[sent:])


def run_f64(stdin, stdout, controller, telemetry_count):
    n = controller.feet
    obs_frame = struct.Struct("<8s%dd" % (20 + 11 * n))
    act_frame = struct.Struct("<8s%dd" % (2 + 12 * n + telemetry_count))
    # One buffer per direction, allocated once: every frame is read into and packed into the same
    # bytes (unpack_from / pack_into), so a tick costs the pipe round trip and little else.
    obs_buffer = bytearray(obs_frame.size)
    obs_view = memoryview(obs_buffer)
    act_view = memoryview(bytearray(act_frame.size))
    stdout.flush()  # the ready line went through the text stream; frames bypass it
    out_fd = stdout.fileno()
    while True:
        if not stdin.read_exactly(obs_view):
            return 0  # the harness closed our stdin
        fields = obs_frame.unpack_from(obs_buffer)
        if fields[0] == b"FOOTBYE1":
            return 0
        if fields[0] != b"FOOTOBS1":
            sys.stderr.write("stand_controller: bad frame tag %r\n" % (fields[0],))
            return 2
        start_ns = time.perf_counter_ns()
        a = controller.tick(decode_f64_observation(fields[1:], n))
        compute_us = (time.perf_counter_ns() - start_ns) / 1000
        act_frame.pack_into(act_view, 0, b"FOOTACT1", a["tick"], compute_us, *a["mode"], *a["groundForce_N"],
                            *a["footTarget_m"], *a["footTargetVelocity_mps"], *a["stiffness_N_per_m"],
                            *a["damping_Ns_per_m"], *a["telemetry"])
        write_all(out_fd, act_view)


def main():
    stdin = StdinReader(sys.stdin.fileno(), spin_us_from_environment())
    try:
        return serve(stdin, sys.stdout)
    finally:
        stdin.close()


def serve(stdin, stdout):
    hello = json.loads(stdin.readline())
    if hello.get("type") != "hello" or hello.get("protocol") != PROTOCOL_VERSION:
        sys.stderr.write("stand_controller: expected a protocol %d hello, got %r\n" % (PROTOCOL_VERSION, hello))
        return 2
    controller = StandController(hello)
    wanted = hello.get("options", {}).get("encoding", "f64")
    encoding = wanted if wanted in hello.get("encodings", ["json"]) else "json"
    send(stdout, {"type": "ready", "protocol": PROTOCOL_VERSION, "telemetryNames": TELEMETRY_NAMES,
                  "encoding": encoding, "about": "examples/python/stand_controller.py"})
    if encoding == "f64":
        return run_f64(stdin, stdout, controller, len(TELEMETRY_NAMES))
    return run_json(stdin, stdout, controller)


if __name__ == "__main__":
    sys.exit(main())
