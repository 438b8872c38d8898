// A standing controller as a process build in C++ (the f64 binary protocol):
//   g++ -std=c++17 -O2 -ffp-contract=off -o build/stand_controller examples/cpp/stand_controller.cpp
//   footing run … --build 'stand-cpp=exec:build/stand_controller'
//
// The same logic as examples/typescript/stand_controller.ts, with the same floating-point
// operations in the same order (-ffp-contract=off keeps the compiler from fusing a·b + c into one
// rounding), so its actions equal the TypeScript example's (test/builds/cpp/). Every foot is in
// stance; each foot's wanted ground force is an even share of the weight along −gravity and of a
// PD force on trunk height (plus a horizontal velocity damper), plus its part of a PD torque on
// trunk attitude spread by lever arm; the legs hold a small impedance toward the standing foot
// position below each hip. tick allocates nothing.

#include <cmath>
#include <vector>

#include "footing_stdio.hpp"

namespace {

const double PI = 3.141592653589793;  // the double nearest π, as JavaScript's Math.PI

class StandController {
 public:
  explicit StandController(const footing::Hello& hello) : n_(hello.footCount), footTarget_(3 * static_cast<std::size_t>(hello.footCount), 0.0) {
    const footing::Json& robot = hello.robot();
    mass_kg_ = robot["trunk"]["mass_kg"].num() + n_ * robot["foot"]["mass_kg"].num();
    for (int k = 0; k < 3; ++k) g_[k] = hello.gravity_mps2[k];
    const double gNorm = std::sqrt(g_[0] * g_[0] + g_[1] * g_[1] + g_[2] * g_[2]);
    for (int k = 0; k < 3; ++k) up_[k] = -g_[k] / gNorm;
    height_m_ = robot["standingHeight_m"].num();
    const footing::Json& inertia = robot["trunk"]["inertia_kgm2"];
    const double inertia_kgm2 = (inertia[0][0].num() + inertia[1][1].num()) / 2;

    // k = M·ω², d = 2·ζ·M·ω for a second-order response of natural frequency ω (common practice).
    const double heightOmega = 2 * PI * hello.option("heightFrequency_Hz", 3.0);
    const double attitudeOmega = 2 * PI * hello.option("attitudeFrequency_Hz", 3.0);
    const double zeta = hello.option("dampingRatio", 1.0);
    heightKp_ = mass_kg_ * heightOmega * heightOmega;
    heightKd_ = 2 * zeta * mass_kg_ * heightOmega;
    attitudeKp_ = inertia_kgm2 * attitudeOmega * attitudeOmega;
    attitudeKd_ = 2 * zeta * inertia_kgm2 * attitudeOmega;
    horizontalKd_ = hello.option("horizontalDamping_per_s", 2.0) * mass_kg_;
    legStiffness_ = hello.option("legStiffness_N_per_m", 200.0);
    legDamping_ = hello.option("legDamping_Ns_per_m", 5.0);
    for (int i = 0; i < n_; ++i) footTarget_[3 * i + 2] = -(height_m_ + robot["hips_m"][i][2].num());
  }

  void tick(const footing::Observation& obs, footing::Action& action) {
    const double* p = obs.trunkPosition_m;
    const double* v = obs.trunkVelocity_mps;
    const double qw = obs.trunkQuaternion[0];
    const double qx = obs.trunkQuaternion[1];
    const double qy = obs.trunkQuaternion[2];
    const double qz = obs.trunkQuaternion[3];
    const double* wb = obs.trunkAngularVelocity_radps;
    const double* feet = obs.footPosition_m;

    const double r00 = 1 - 2 * (qy * qy + qz * qz);
    const double r01 = 2 * (qx * qy - qw * qz);
    const double r02 = 2 * (qx * qz + qw * qy);
    const double r10 = 2 * (qx * qy + qw * qz);
    const double r11 = 1 - 2 * (qx * qx + qz * qz);
    const double r12 = 2 * (qy * qz - qw * qx);
    const double r20 = 2 * (qx * qz - qw * qy);
    const double r21 = 2 * (qy * qz + qw * qx);
    const double r22 = 1 - 2 * (qx * qx + qy * qy);
    const double wx = r00 * wb[0] + r01 * wb[1] + r02 * wb[2];
    const double wy = r10 * wb[0] + r11 * wb[1] + r12 * wb[2];
    const double wz = r20 * wb[0] + r21 * wb[1] + r22 * wb[2];

    // Tilt error: trunk z axis × up, the axis that rights the trunk, of length sin(tilt).
    const double ex = r12 * up_[2] - r22 * up_[1];
    const double ey = r22 * up_[0] - r02 * up_[2];
    const double ez = r02 * up_[1] - r12 * up_[0];
    const double tx = attitudeKp_ * ex - attitudeKd_ * wx;
    const double ty = attitudeKp_ * ey - attitudeKd_ * wy;
    const double tz = attitudeKp_ * ez - attitudeKd_ * wz;

    const double heightError = height_m_ - p[2];
    const double fx = -mass_kg_ * g_[0] - horizontalKd_ * v[0];
    const double fy = -mass_kg_ * g_[1] - horizontalKd_ * v[1];
    const double fz = -mass_kg_ * g_[2] + (heightKp_ * heightError - heightKd_ * v[2]);

    double leverSum = 0.0;
    for (int i = 0; i < n_; ++i) {
      const double rx = feet[3 * i] - p[0];
      const double ry = feet[3 * i + 1] - p[1];
      const double rz = feet[3 * i + 2] - p[2];
      leverSum += rx * rx + ry * ry + rz * rz;
    }

    // f_i = F/N + (τ × r_i)/Σ|r|²: a plain spread by lever arm (see the TypeScript example).
    for (int i = 0; i < n_; ++i) {
      const double rx = feet[3 * i] - p[0];
      const double ry = feet[3 * i + 1] - p[1];
      const double rz = feet[3 * i + 2] - p[2];
      action.groundForce_N[3 * i] = fx / n_ + (ty * rz - tz * ry) / leverSum;
      action.groundForce_N[3 * i + 1] = fy / n_ + (tz * rx - tx * rz) / leverSum;
      action.groundForce_N[3 * i + 2] = fz / n_ + (tx * ry - ty * rx) / leverSum;
      action.mode[i] = 1;
      action.stiffness_N_per_m[i] = legStiffness_;
      action.damping_Ns_per_m[i] = legDamping_;
    }
    for (int k = 0; k < 3 * n_; ++k) {
      action.footTarget_m[k] = footTarget_[k];
      action.footTargetVelocity_mps[k] = 0.0;
    }
    action.telemetry[0] = heightError;
    action.telemetry[1] = std::sqrt(ex * ex + ey * ey + ez * ez);
  }

 private:
  int n_;
  std::vector<double> footTarget_;
  double mass_kg_ = 0, g_[3] = {0, 0, 0}, up_[3] = {0, 0, 0}, height_m_ = 0;
  double heightKp_ = 0, heightKd_ = 0, attitudeKp_ = 0, attitudeKd_ = 0, horizontalKd_ = 0, legStiffness_ = 0, legDamping_ = 0;
};

}  // namespace

int main() {
  return footing::run<StandController>({"stand.heightError_m", "stand.tiltError"}, "examples/cpp/stand_controller.cpp");
}
