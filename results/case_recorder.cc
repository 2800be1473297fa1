#include "results/case_recorder.h"

#include <algorithm>
#include <cmath>
#include <utility>

namespace lcc {

CaseRecorder::CaseRecorder(const std::vector<Probe>& probes, const AnalysisChannels& channels, double keep,
                           double sample, double from, double to, RecorderOptions probes_options, double longest)
    : probes_(probes, std::move(probes_options)), channels_(channels), width_(static_cast<int>(channels.channels.size())),
      from_(from), to_(to), half_(0.5 * sample), sample_(sample) {
  extremes_.assign(width_, {});
  double span = to > from ? to - from : keep;
  // A window longer than the run (a low fundamental against a short stop,
  // or a chosen window past the stop) would size the ring for samples that
  // never come: at 1 µHz, 2 cycles of 20 µs samples are 10¹¹ rows, which
  // failed the case with bad_alloc before any of its results were written.
  if (longest > 0) span = std::min(span, longest);
  capacity_ = static_cast<std::size_t>(std::ceil(span / sample)) + 4;
  times_.assign(capacity_, 0.0);
  columns_.assign(width_, std::vector<double>(capacity_, 0.0));
}

std::optional<std::vector<int>> CaseRecorder::unknowns_read() const {
  std::vector<int> read = *probes_.unknowns_read();
  for (const auto& channel : channels_.channels) channel.form.AppendUnknowns(&read);
  return read;
}

void CaseRecorder::OnSample(double t, const double* y, const double* yp) {
  probes_.OnSample(t, y, yp);
  if (width_ == 0) return;
  const bool faulted = fault_time_ >= 0 && t >= fault_time_ - half_;
  const bool in_window = !(to_ > from_) || (t >= from_ - half_ && t <= to_ + half_);
  if (!in_window && !faulted && !track_whole_run_) return;
  const std::size_t slot = count_ % capacity_;
  for (int c = 0; c < width_; ++c) {
    const double x = channels_.channels[c].form.Evaluate(y, yp);
    if (in_window) columns_[c][slot] = x;
    Extremes& e = extremes_[c];
    if (!e.seen) {
      e.min = e.max = x;
      e.seen = true;
    }
    e.min = std::min(e.min, x);
    e.max = std::max(e.max, x);
    if (!faulted) continue;
    if (e.sign_at_fault == 0.0) e.sign_at_fault = x > 0 ? 1.0 : x < 0 ? -1.0 : 0.5;
    e.peak_after_fault = std::max(e.peak_after_fault, std::abs(x));
    e.square_integral_after_fault += x * x * sample_;
    if (e.first_zero_after_fault < 0 && e.sign_at_fault != 0.5 && x * e.sign_at_fault <= 0) e.first_zero_after_fault = t;
  }
  if (in_window) {
    times_[slot] = t;
    ++count_;
  }
}

CaseRecorder::Window CaseRecorder::Extract(double begin, double end) {
  const std::size_t n = std::min(count_, capacity_);
  // Oldest first: rotate the ring so that it starts at index 0. With
  // count_ = n the next sample still goes to the slot after the newest.
  const std::size_t oldest = (count_ - n) % capacity_;
  if (oldest != 0) {
    std::rotate(times_.begin(), times_.begin() + oldest, times_.end());
    for (auto& c : columns_) std::rotate(c.begin(), c.begin() + oldest, c.end());
  }
  count_ = n;
  std::size_t first = 0, last = 0;
  for (std::size_t r = 0; r < n; ++r) {
    if (times_[r] < begin - half_) first = r + 1;
    if (times_[r] < end - half_) last = r + 1;
  }
  first = std::min(first, last);
  Window w;
  w.t = std::span<const double>(times_).subspan(first, last - first);
  for (const auto& c : columns_) w.columns.push_back(std::span<const double>(c).subspan(first, last - first));
  return w;
}

std::unique_ptr<CaseRecorder> RecorderFor(const Study& study, const AnalysisChannels& channels,
                                          const RecorderOptions& probes_options) {
  const double f = RunFrequency(study);
  const double sample = OutputInterval(study);
  const double stop = study.simulate ? study.simulate->stop : 0.0;
  // The window's length plus a tenth of a cycle, so rounding never drops a
  // sample of it; the whole run when nothing is periodic.
  const double keep = f > 0 ? ((study.steady ? study.steady->cycles : 1) + 0.1) / f : stop;
  double from = 0.0, to = 0.0;
  if (study.window) {
    from = study.window->from;
    to = study.window->to;
  } else if (!study.steady && f > 0) {
    from = std::max(0.0, stop - keep);
    to = stop;
  }
  return std::make_unique<CaseRecorder>(study.probes, channels, keep, sample, from, to, probes_options, stop);
}

}  // namespace lcc
