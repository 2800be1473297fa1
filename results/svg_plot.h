// CASE/waveforms.svg: the probes over the analysis window (normally the last
// recorded cycles), drawn as a self-contained SVG that any browser or image
// tool shows without other files.
//
// One panel per unit (volts, amperes, ...), stacked, sharing the time axis;
// each panel has its ticks, grid, axis labels with units and a legend.
// Long windows are thinned to at most two points (the minimum and the
// maximum) per horizontal pixel, so peaks and notches stay visible.
#pragma once

#include <string>

#include "results/recorder.h"

namespace lcc {

struct PlotOptions {
  std::string title;
  double begin = 0.0, end = 0.0;  // s, the time span drawn
  int width = 960;                // px
  int panel_height = 260;         // px per panel
};

std::string RenderWaveformsSvg(const ProbeRecorder& recorder, const PlotOptions& options);

}  // namespace lcc
