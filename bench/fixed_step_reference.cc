#include "bench/fixed_step_reference.h"

#include <Eigen/Dense>
#include <array>
#include <chrono>
#include <cmath>
#include <numbers>

namespace lcc::bench {
namespace {

constexpr int kNodes = 5;        // a, b, c, p, n (ground: the supply's star point)
constexpr int kP = 3, kN = 4;
using Vec = Eigen::Matrix<double, kNodes, 1>;
using Mat = Eigen::Matrix<double, kNodes, kNodes>;

struct State {
  double t = 0.0;
  Vec v = Vec::Zero();
  std::array<double, 3> i_l{}, v_l{};  // inductor currents (into node k) and voltages e_k − v_k
};

State Lerp(const State& a, const State& b, double s) {
  State r;
  r.t = a.t + s * (b.t - a.t);
  r.v = a.v + s * (b.v - a.v);
  for (int k = 0; k < 3; ++k) {
    r.i_l[k] = a.i_l[k] + s * (b.i_l[k] - a.i_l[k]);
    r.v_l[k] = a.v_l[k] + s * (b.v_l[k] - a.v_l[k]);
  }
  return r;
}

class Bridge {
 public:
  Bridge(const FixedStepCircuit& c, double h)
      : c_(c), h_(h), w_(2 * std::numbers::pi * c.f), e_(std::sqrt(2.0 / 3.0) * c.vll), g_l_(h / (2 * c.ls)) {}

  double Emf(int k, double t) const { return e_ * std::sin(w_ * t - k * 2 * std::numbers::pi / 3); }
  // Diode d: 0..2 from phase d to p, 3..5 from n to phase d − 3.
  static int Anode(int d) { return d < 3 ? d : kN; }
  static int Cathode(int d) { return d < 3 ? kP : d - 3; }
  double Conductance(int d) const { return on_[d] ? 1.0 / c_.r_on : 1.0 / c_.r_off; }
  double Voltage(int d, const State& s) const { return s.v[Anode(d)] - s.v[Cathode(d)]; }
  double Current(int d, const State& s) const { return Voltage(d, s) * Conductance(d); }

  void Factorize() {
    Mat g = Mat::Zero();
    for (int k = 0; k < 3; ++k) g(k, k) += g_l_;
    for (int d = 0; d < 6; ++d) {
      const int a = Anode(d), b = Cathode(d);
      const double y = Conductance(d);
      g(a, a) += y;
      g(b, b) += y;
      g(a, b) -= y;
      g(b, a) -= y;
    }
    lu_.compute(g);
  }

  // One trapezoidal step of length h_ from `from`; or, with
  // `backward_euler`, one backward-Euler step of h_/2, whose companion
  // conductance (h/2)/L is the trapezoidal one's, so the same factorisation
  // serves (critical damping adjustment: J. R. Marti & J. Lin, "Suppression
  // of numerical oscillations in the EMTP", IEEE Trans. PWRS-4(2), 1989).
  State Step(const State& from, bool backward_euler = false) {
    State s;
    s.t = from.t + (backward_euler ? 0.5 * h_ : h_);
    Vec rhs = Vec::Zero();
    std::array<double, 3> history{}, emf{};
    for (int k = 0; k < 3; ++k) {
      history[k] = from.i_l[k] + (backward_euler ? 0.0 : g_l_ * from.v_l[k]);
      emf[k] = Emf(k, s.t);
      rhs[k] += g_l_ * emf[k] + history[k];
    }
    rhs[kP] -= c_.id;
    rhs[kN] += c_.id;
    s.v = lu_.solve(rhs);
    for (int k = 0; k < 3; ++k) {
      s.v_l[k] = emf[k] - s.v[k];
      s.i_l[k] = g_l_ * s.v_l[k] + history[k];
    }
    ++steps_;
    return s;
  }

  FixedStepCircuit c_;
  double h_, w_, e_, g_l_;
  std::array<bool, 6> on_{};
  Eigen::PartialPivLU<Mat> lu_;
  long steps_ = 0;
};

}  // namespace

FixedStepResult RunFixedStep(const FixedStepCircuit& c, double h, double seconds) {
  const auto start = std::chrono::steady_clock::now();
  Bridge b(c, h);
  const double w = 2 * std::numbers::pi * c.f;
  const double mu = std::acos(1 - 2 * w * c.ls * c.id / (std::sqrt(2.0) * c.vll));
  // Just after the commutation from phase c to phase a on top (natural
  // instant ωt = 30°), phase b conducting below: iA = Id, iB = −Id, and
  // with Id constant no inductor voltage (each node at its EMF).
  State s;
  s.t = (std::numbers::pi / 6 + mu + 5 * std::numbers::pi / 180) / w;
  s.i_l = {c.id, -c.id, 0.0};
  for (int k = 0; k < 3; ++k) s.v[k] = b.Emf(k, s.t);
  s.v[kP] = s.v[0];
  s.v[kN] = s.v[1];
  b.on_[0] = b.on_[4] = true;
  b.Factorize();

  const double t_end = s.t + seconds;
  const double window_begin = t_end - 2.0 / c.f;
  double vd_integral = 0.0;
  long switchings = 0;
  std::vector<double> top_on, top_off, bottom_on, bottom_off;
  auto integrate = [&](const State& a, const State& z) {  // trapezoid of Vd over [a.t, z.t] within the window
    const double t0 = std::max(a.t, window_begin);
    if (z.t <= t0) return;
    const double s0 = (t0 - a.t) / (z.t - a.t);
    const State from = Lerp(a, z, s0);
    vd_integral += 0.5 * ((from.v[kP] - from.v[kN]) + (z.v[kP] - z.v[kN])) * (z.t - t0);
  };

  while (s.t < t_end - 0.5 * h) {
    State next = b.Step(s);
    // Where within the step each diode leaves its rule (2: it does not),
    // by linear interpolation of its current (on) or voltage (off).
    std::array<double, 6> crossing{};
    double first = 2.0;
    for (int d = 0; d < 6; ++d) {
      crossing[d] = 2.0;
      if (b.on_[d] && b.Current(d, next) < 0) {
        const double i0 = b.Current(d, s), i1 = b.Current(d, next);
        crossing[d] = i0 > 0 ? i0 / (i0 - i1) : 0.0;
      } else if (!b.on_[d] && b.Voltage(d, next) > 0) {
        const double v0 = b.Voltage(d, s), v1 = b.Voltage(d, next);
        crossing[d] = v0 < 0 ? -v0 / (v1 - v0) : 0.0;
      }
      first = std::min(first, crossing[d]);
    }
    if (first > 1.0) {
      integrate(s, next);
      s = next;
      continue;
    }
    // Back to the switching instant; switch every diode crossing there.
    const State at = Lerp(s, next, first);
    integrate(s, at);
    for (int d = 0; d < 6; ++d) {
      if (crossing[d] > first + 1e-9) continue;
      b.on_[d] = !b.on_[d];
      ++switchings;
      if (at.t >= window_begin - 1.0 / c.f) {
        auto& list = d < 3 ? (b.on_[d] ? top_on : top_off) : (b.on_[d] ? bottom_on : bottom_off);
        list.push_back(at.t);
      }
    }
    b.Factorize();
    // From the switching instant, two backward-Euler half steps: the
    // trapezoidal rule would ring on the jump of the inductor voltages (an
    // open phase keeps any inconsistency between its L's voltage and
    // current for ever) and make the diodes chatter. The grid then runs on
    // from the switching instant: the step stays h, its phase shifts (an
    // interpolation back onto the old grid would mix the states before and
    // after the switching, and start the ringing again).
    const State half = b.Step(at, true);
    const State after = b.Step(half, true);
    integrate(at, half);
    integrate(half, after);
    s = after;
  }

  FixedStepResult r;
  r.vd_mean = vd_integral / (t_end - window_begin);
  // Overlap: from each turn-on in the window to the next turn-off on the same side.
  double sum = 0.0;
  int count = 0;
  auto overlaps = [&](const std::vector<double>& on, const std::vector<double>& off) {
    for (double t_on : on) {
      if (t_on < window_begin) continue;
      for (double t_off : off)
        if (t_off > t_on) {
          sum += w * (t_off - t_on);
          ++count;
          break;
        }
    }
  };
  overlaps(top_on, top_off);
  overlaps(bottom_on, bottom_off);
  r.overlap_deg = count ? sum / count * 180 / std::numbers::pi : 0.0;
  r.steps = b.steps_;
  r.switchings = switchings;
  r.cpu_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return r;
}

}  // namespace lcc::bench
