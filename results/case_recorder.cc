#include "results/case_recorder.h"

#include <algorithm>
#include <cmath>

namespace lcc {

CaseRecorder::CaseRecorder(const std::vector<Probe>& probes, const AnalysisChannels& channels, double keep,
                           double sample, double from, double to)
    : probes_(probes), channels_(channels), width_(static_cast<int>(channels.channels.size())),
      from_(from), to_(to), half_(0.5 * sample) {
  const double span = to > from ? to - from : keep;
  capacity_ = static_cast<std::size_t>(std::ceil(span / sample)) + 4;
  times_.assign(capacity_, 0.0);
  columns_.assign(width_, std::vector<double>(capacity_, 0.0));
}

void CaseRecorder::OnSample(double t, const double* y, const double* yp) {
  probes_.OnSample(t, y, yp);
  if (width_ == 0) return;
  if (to_ > from_ && (t < from_ - half_ || t > to_ + half_)) return;
  const std::size_t slot = count_ % capacity_;
  times_[slot] = t;
  for (int c = 0; c < width_; ++c) columns_[c][slot] = channels_.channels[c].form.Evaluate(y, yp);
  ++count_;
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

}  // namespace lcc
