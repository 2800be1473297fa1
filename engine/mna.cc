#include "engine/mna.h"

#include <fmt/format.h>

#include <algorithm>
#include <cstddef>

namespace lcc {
namespace {

// Records positions on the first pass.
class PatternSink final : public StampSink {
 public:
  std::vector<Eigen::Triplet<double, int>> g, c;
  void G(int row, int col, double) override { g.emplace_back(row, col, 0.0); }
  void C(int row, int col, double value) override { c.emplace_back(row, col, value); }
};

// Writes values into pre-computed slots; entries on ground rows or columns
// are dropped consistently with the pattern pass.
class ValueSink final : public StampSink {
 public:
  ValueSink(const std::vector<int>& g_slot, const std::vector<int>& c_slot, double* g, double* c)
      : g_slot_(g_slot), c_slot_(c_slot), g_(g), c_(c) {}
  void G(int row, int col, double value) override {
    if (row < 0 || col < 0) return;
    if (g_) g_[g_slot_[gk_]] += value;
    ++gk_;
  }
  void C(int row, int col, double value) override {
    if (row < 0 || col < 0) return;
    if (c_) c_[c_slot_[ck_]] += value;
    ++ck_;
  }

 private:
  const std::vector<int>& g_slot_;
  const std::vector<int>& c_slot_;
  double* g_;
  double* c_;
  std::size_t gk_ = 0, ck_ = 0;
};

int SlotOf(const MnaSystem::SparseMatrix& m, int row, int col) {
  const int* inner = m.innerIndexPtr();
  const int begin = m.outerIndexPtr()[col], end = m.outerIndexPtr()[col + 1];
  const int* it = std::lower_bound(inner + begin, inner + end, row);
  return static_cast<int>(it - inner);
}

}  // namespace

MnaSystem::MnaSystem(const Circuit& circuit, const LuOptions& lu) : circuit_(&circuit), n_(circuit.num_unknowns()) {
  PatternSink pattern_sink;
  for (const auto& d : circuit.devices()) d->Stamp(pattern_sink, false);
  auto drop_ground = [](std::vector<Eigen::Triplet<double, int>>& t) {
    t.erase(std::remove_if(t.begin(), t.end(), [](const auto& x) { return x.row() < 0 || x.col() < 0; }),
            t.end());
  };
  drop_ground(pattern_sink.g);
  drop_ground(pattern_sink.c);

  std::vector<Eigen::Triplet<double, int>> all = pattern_sink.g;
  all.insert(all.end(), pattern_sink.c.begin(), pattern_sink.c.end());
  // The diagonal is always in the pattern: the LU may need it for pivoting.
  for (int k = 0; k < n_; ++k) all.emplace_back(k, k, 0.0);
  pattern_.resize(n_, n_);
  pattern_.setFromTriplets(all.begin(), all.end());
  pattern_.makeCompressed();

  for (const auto& t : pattern_sink.g) g_slot_.push_back(SlotOf(pattern_, t.row(), t.col()));
  for (const auto& t : pattern_sink.c) c_slot_.push_back(SlotOf(pattern_, t.row(), t.col()));
  g_values_.assign(pattern_.nonZeros(), 0.0);
  c_values_.assign(pattern_.nonZeros(), 0.0);
  {
    ValueSink sink(g_slot_, c_slot_, nullptr, c_values_.data());
    for (const auto& d : circuit.devices()) d->Stamp(sink, false);
  }

  differential_.assign(n_, 0);
  for (int col = 0; col < n_; ++col) {
    for (int p = pattern_.outerIndexPtr()[col]; p < pattern_.outerIndexPtr()[col + 1]; ++p)
      if (c_values_[p] != 0.0) differential_[col] = 1;
    if (differential_[col]) differential_indices_.push_back(col);
    else output_rows_.push_back(col);
  }
  for (const auto& d : circuit.devices())
    if (d->has_sources()) {
      source_devices_.push_back(d.get());
      d->SourceRows(&source_rows_);
    }
  std::sort(source_rows_.begin(), source_rows_.end());
  source_rows_.erase(std::unique(source_rows_.begin(), source_rows_.end()), source_rows_.end());
  b_.assign(n_, 0.0);
  z_.setZero(n_);
  states_.assign(circuit.num_switch_slots(), 0);
  SetSwitchStates(states_);
  consistency_values_.assign(pattern_.nonZeros(), 0.0);
  consistency_lu_ = std::make_unique<LuSolver>(pattern_, lu);
  step_lu_ = std::make_unique<LuSolver>(pattern_, lu);
}

void MnaSystem::SetSwitchStates(const std::vector<std::uint8_t>& states) {
  if (states == states_ && consistency_factored_) return;  // G unchanged: keep the factorisations
  states_ = states;
  consistency_factored_ = false;
  step_factored_h_ = 0.0;
  present_response_ = -1;
  b_valid_ = false;
  std::fill(g_values_.begin(), g_values_.end(), 0.0);
  ValueSink sink(g_slot_, c_slot_, g_values_.data(), nullptr);
  for (const auto& d : circuit_->devices()) {
    const bool on = d->switch_slot() >= 0 && states_[d->switch_slot()];
    d->Stamp(sink, on);
  }
}

bool MnaSystem::Rebind(const Circuit& other, std::string* error) {
  if (other.num_unknowns() != n_ || other.devices().size() != circuit_->devices().size() ||
      other.num_switch_slots() != circuit_->num_switch_slots()) {
    *error = "the circuit changed its structure; only values may change during a run";
    return false;
  }
  std::vector<double> c(pattern_.nonZeros(), 0.0);
  ValueSink sink(g_slot_, c_slot_, nullptr, c.data());
  for (const auto& d : other.devices()) d->Stamp(sink, false);
  for (int col = 0; col < n_; ++col) {
    bool differential = false;
    for (int p = pattern_.outerIndexPtr()[col]; p < pattern_.outerIndexPtr()[col + 1]; ++p)
      differential |= c[p] != 0.0;
    if (differential != static_cast<bool>(differential_[col])) {
      *error = fmt::format("a value set during the run makes {} {} a state variable", other.UnknownName(col),
                           differential ? "become" : "cease to be");
      return false;
    }
  }
  circuit_ = &other;
  c_values_ = c;
  b_valid_ = false;
  source_devices_.clear();
  for (const auto& d : other.devices())
    if (d->has_sources()) source_devices_.push_back(d.get());
  consistency_factored_ = false;
  step_factored_h_ = 0.0;
  kept_responses_.clear();  // the values changed: every configuration's responses did
  present_response_ = -1;
  const std::vector<std::uint8_t> states = states_;
  states_.clear();  // forces the re-stamp
  SetSwitchStates(states);
  return true;
}

void MnaSystem::Sources(double t, double* b) const {
  std::fill(b, b + n_, 0.0);
  for (const Device* d : source_devices_) {
    const bool on = d->switch_slot() >= 0 && states_[d->switch_slot()];
    d->AddSources(t, on, b);
  }
}

void MnaSystem::Residual(double t, const double* y, const double* yp, double* r) const {
  if (!b_valid_ || t != b_time_) {
    Sources(t, b_.data());
    b_time_ = t;
    b_valid_ = true;
  }
  for (int k = 0; k < n_; ++k) r[k] = -b_[k];
  const int* outer = pattern_.outerIndexPtr();
  const int* inner = pattern_.innerIndexPtr();
  for (int col = 0; col < n_; ++col) {
    const double yc = y[col], ypc = yp[col];
    for (int p = outer[col]; p < outer[col + 1]; ++p)
      r[inner[p]] += g_values_[p] * yc + c_values_[p] * ypc;
  }
}

void MnaSystem::JacobianValues(double cj, double* values) const {
  for (std::size_t p = 0; p < g_values_.size(); ++p) values[p] = g_values_[p] + cj * c_values_[p];
}

bool MnaSystem::SolveConsistent(double t, double* y, double* yp, std::string* error) {
  const int* outer = pattern_.outerIndexPtr();
  const int* inner = pattern_.innerIndexPtr();
  double* m = consistency_values_.data();
  Eigen::VectorXd rhs(n_);
  Sources(t, rhs.data());
  for (int col = 0; col < n_; ++col) {
    for (int p = outer[col]; p < outer[col + 1]; ++p) {
      if (differential_[col]) {
        m[p] = c_values_[p];
        rhs[inner[p]] -= g_values_[p] * y[col];
      } else {
        m[p] = g_values_[p];
      }
    }
  }
  if (!consistency_factored_) {
    if (!consistency_lu_->Factorize(m)) {
      *error = fmt::format("the circuit equations are singular at t = {:.9g} s in the present valve states", t);
      return false;
    }
    consistency_factored_ = true;
  }
  Eigen::VectorXd z(n_);
  consistency_lu_->Solve(rhs.data(), z.data());
  for (int k = 0; k < n_; ++k) {
    if (!std::isfinite(z[k])) {
      *error = fmt::format("the circuit equations are singular at t = {:.9g} s (unknown {})", t,
                           circuit_->UnknownName(k));
      return false;
    }
    if (differential_[k]) {
      yp[k] = z[k];
    } else {
      y[k] = z[k];
      yp[k] = 0.0;
    }
  }
  return true;
}

}  // namespace lcc

namespace lcc {

bool MnaSystem::BackwardEulerStep(double t, double h, double* y, std::string* error) {
  const int* outer = pattern_.outerIndexPtr();
  const int* inner = pattern_.innerIndexPtr();
  std::vector<double>& m = consistency_values_;  // scratch of the pattern's size
  Eigen::VectorXd rhs(n_);
  Sources(t + h, rhs.data());
  for (int col = 0; col < n_; ++col) {
    for (int p = outer[col]; p < outer[col + 1]; ++p) {
      m[p] = g_values_[p] + c_values_[p] / h;
      rhs[inner[p]] += c_values_[p] / h * y[col];
    }
  }
  if (step_factored_h_ != h) {
    if (!step_lu_->Factorize(m.data())) {
      *error = fmt::format("the circuit equations are singular at t = {:.9g} s in the present valve states", t);
      return false;
    }
    step_factored_h_ = h;
  }
  step_lu_->Solve(rhs.data(), y);
  return true;
}

}  // namespace lcc

namespace lcc {

void MnaSystem::SetOutputUnknowns(const std::vector<int>& unknowns) {
  output_rows_.clear();
  for (int k : unknowns)
    if (k >= 0 && k < n_ && !differential_[k]) output_rows_.push_back(k);
  std::sort(output_rows_.begin(), output_rows_.end());
  output_rows_.erase(std::unique(output_rows_.begin(), output_rows_.end()), output_rows_.end());
  kept_responses_.clear();
  present_response_ = -1;
}

MnaSystem::KeptResponse& MnaSystem::ResponseForPresentStates() {
  if (present_response_ < 0) {
    for (int i = 0; i < static_cast<int>(kept_responses_.size()); ++i)
      if (kept_responses_[i].states == states_) present_response_ = i;
  }
  if (present_response_ < 0) {
    // A configuration not seen before. Make room by dropping the least
    // recently used ones, as many as the byte budget needs.
    const std::size_t bytes = sizeof(double) * output_rows_.size() * (source_rows_.size() + differential_indices_.size());
    while (!kept_responses_.empty() && (kept_responses_.size() + 1) * bytes > kKeptResponseBytes) {
      auto oldest = std::min_element(kept_responses_.begin(), kept_responses_.end(),
                                     [](const KeptResponse& a, const KeptResponse& b) { return a.last_used < b.last_used; });
      kept_responses_.erase(oldest);
    }
    kept_responses_.push_back(KeptResponse{states_, 0, 0, false, {}});
    present_response_ = static_cast<int>(kept_responses_.size()) - 1;
  }
  KeptResponse& kept = kept_responses_[present_response_];
  kept.last_used = ++response_clock_;
  return kept;
}

void MnaSystem::RecomputeAlgebraic(double t, double* y) {
  // y_alg = M⁻¹·(b(t) − G_d·y_d) = Σ_r b_r(t)·(M⁻¹e_r) − Σ_d y_d·(M⁻¹G[:,d]).
  // The responses make each sample one short matrix-vector product instead
  // of a solve. They cost solves to build: one per response column
  // (M·z = e_r or G[:,d]) or, when fewer unknowns are read than there are
  // columns, one transposed solve per unknown read (Mᵀ·x = e_k gives row k
  // of M⁻¹). Whether that pays depends on how many samples the
  // configuration will see, not known in advance; so its first samples, as
  // many as the build's solves, are solved directly and only then are the
  // responses built (the rent-or-buy rule: never more than twice the cost
  // of the better choice in hindsight), to be kept for its later returns.
  const int* outer = pattern_.outerIndexPtr();
  const int* inner = pattern_.innerIndexPtr();
  const int nr = static_cast<int>(source_rows_.size());
  const int nd = static_cast<int>(differential_indices_.size());
  const int m = static_cast<int>(output_rows_.size());
  if (m == 0) return;
  const bool by_rows = m < nr + nd;
  KeptResponse& kept = ResponseForPresentStates();
  if (!kept.built && kept.direct < std::min(m, nr + nd)) {
    ++kept.direct;
    Sources(t, b_.data());
    for (int col : differential_indices_)
      for (int p = outer[col]; p < outer[col + 1]; ++p) b_[inner[p]] -= g_values_[p] * y[col];
    consistency_lu_->Solve(b_.data(), z_.data());
    for (int k : output_rows_) y[k] = z_[k];
    return;
  }
  auto& response = kept.rows;
  if (!kept.built) {
    response.resize(m, nr + nd);
    if (by_rows) {
      for (int i = 0; i < m; ++i) {
        rhs_.setZero(n_);
        rhs_[output_rows_[i]] = 1.0;
        consistency_lu_->SolveTransposed(rhs_.data(), z_.data());
        for (int k = 0; k < nr; ++k) response(i, k) = z_[source_rows_[k]];
        for (int k = 0; k < nd; ++k) {
          const int col = differential_indices_[k];
          double sum = 0.0;
          for (int p = outer[col]; p < outer[col + 1]; ++p) sum += z_[inner[p]] * g_values_[p];
          response(i, nr + k) = sum;
        }
      }
    } else {
      for (int k = 0; k < nr + nd; ++k) {
        rhs_.setZero(n_);
        if (k < nr) {
          rhs_[source_rows_[k]] = 1.0;
        } else {
          const int col = differential_indices_[k - nr];
          for (int p = outer[col]; p < outer[col + 1]; ++p) rhs_[inner[p]] = g_values_[p];
        }
        consistency_lu_->Solve(rhs_.data(), z_.data());
        for (int i = 0; i < m; ++i) response(i, k) = z_[output_rows_[i]];
      }
    }
    kept.built = true;
  }
  Sources(t, b_.data());
  drive_.resize(nr + nd);
  for (int k = 0; k < nr; ++k) drive_[k] = b_[source_rows_[k]];
  for (int k = 0; k < nd; ++k) drive_[nr + k] = -y[differential_indices_[k]];
  const int columns = nr + nd;
  for (int i = 0; i < m; ++i) {
    const double* row = response.data() + static_cast<std::ptrdiff_t>(i) * columns;
    double sum = 0.0;
    for (int k = 0; k < columns; ++k) sum += row[k] * drive_[k];
    y[output_rows_[i]] = sum;
  }
}

}  // namespace lcc
