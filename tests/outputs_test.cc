// The output files of a case: summary.csv and summary.json, the report
// printed again by `lccsim report`, COMTRADE (IEEE Std C37.111-1999, read
// back by a reader written here from the standard's field list, sharing no
// code with the writer), and the SVG plot (well-formed, and rendered by a
// Debian tool to a PNG that is not blank).
#include <catch2/catch.hpp>
#include <zlib.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <regex>
#include <sstream>
#include <unistd.h>

#include "app/commands.h"
#include "tests/test_utilities/files.h"

namespace lcc {
namespace {

namespace fs = std::filesystem;

std::string Read(const fs::path& p) { return testing::ReadWhole(p); }

std::vector<std::string> Split(const std::string& s, char sep) {
  std::vector<std::string> out;
  std::string field;
  std::istringstream in(s);
  while (std::getline(in, field, sep)) out.push_back(field);
  if (!s.empty() && s.back() == sep) out.push_back("");
  return out;
}

const char* kNetlist = R"(
supply G (a, b, c) Vll = 400 V f = 50 Hz Ssc = 2 MVA xr = 8
pcc at = G IL = 80 A
bridge B ac = (a, b, c) dc = (p, n)
inductor Ld (p, q) L = 10 mH
resistor Rl (q, n) R = 5 ohm
simulate stop = 300 ms
steady cycles = 2
probe Vd = p - n
probe Id = Ld.i
probe Ia = G.a.i
)";

// Runs the netlist once into a fresh folder of this process (shared by the
// tests below; ctest runs each test in a process of its own, in parallel).
const fs::path& RunOnce() {
  static const fs::path out = [] {
    const fs::path dir = fs::temp_directory_path() / ("lccsim-outputs-test-" + std::to_string(getpid()));
    fs::remove_all(dir);
    fs::create_directories(dir);
    std::ofstream(dir / "rect.lcc") << kNetlist;
    std::ostringstream o, e;
    RunCommandOptions options;
    options.netlist = (dir / "rect.lcc").string();
    options.out_dir = (dir / "out").string();
    const int code = RunCommand(options, o, e);
    INFO(e.str());
    REQUIRE(code == kExitOk);
    return dir / "out";
  }();
  return out;
}

TEST_CASE("SummaryCsvHasOneRowPerCaseWithUnitsInTheHeader", "[outputs]") {
  const auto lines = Split(Read(RunOnce() / "summary.csv"), '\n');
  REQUIRE(lines.size() >= 2);
  const auto header = Split(lines[0], ',');
  const auto row = Split(lines[1], ',');
  REQUIRE(header.size() == row.size());
  REQUIRE(header[0] == "case");
  REQUIRE(row[0] == "base");
  REQUIRE(row[1] == "completed");
  for (const char* col : {"Vd mean [V]", "B Vd [V]", "B Vd closed form [V]", "G THD [%]", "G power factor [1]",
                          "G IEEE 519 [pass/fail]"})
    REQUIRE(std::find(header.begin(), header.end(), col) != header.end());
}

TEST_CASE("SummaryJsonCarriesEveryFigureWithUnits", "[outputs]") {
  const auto j = nlohmann::json::parse(Read(RunOnce() / "summary.json"));
  REQUIRE(j.at("caution").get<std::string>().find("licensed engineer") != std::string::npos);
  const auto& c = j.at("cases").at(0);
  REQUIRE(c.at("case_name") == "base");
  REQUIRE(c.at("bridges").at(0).at("vd").at("unit") == "V");
  REQUIRE(c.at("bridges").at(0).at("valves").size() == 6);
  REQUIRE(c.at("ac_points").at(0).at("current_harmonics").size() == 50);
  REQUIRE(c.at("ieee519").at(0).at("il_A") == 80.0);
}

TEST_CASE("ReportCommandPrintsTheSavedReportAgain", "[outputs][app]") {
  std::ostringstream o, e;
  REQUIRE(ReportCommand((RunOnce() / "base").string(), o, e) == kExitOk);
  REQUIRE(o.str() == Read(RunOnce() / "base" / "report.txt"));
  REQUIRE(o.str().find("IEEE Std 519-2014 check at G") != std::string::npos);
  std::ostringstream o2, e2;
  REQUIRE(ReportCommand((RunOnce() / "nowhere").string(), o2, e2) == kExitInputError);
  REQUIRE(e2.str().find("finished case") != std::string::npos);
}

TEST_CASE("FormatsChooseTheFilesWritten", "[outputs][app]") {
  const fs::path dir = fs::temp_directory_path() / "lccsim-formats-test";
  fs::remove_all(dir);
  fs::create_directories(dir);
  std::ofstream(dir / "rect.lcc") << kNetlist;
  RunCommandOptions options;
  options.netlist = (dir / "rect.lcc").string();
  options.out_dir = (dir / "out").string();
  options.formats = {"svg"};
  std::ostringstream o, e;
  REQUIRE(RunCommand(options, o, e) == kExitOk);
  REQUIRE(fs::exists(dir / "out" / "base" / "waveforms.svg"));
  REQUIRE(fs::exists(dir / "out" / "base" / "report.txt"));
  REQUIRE_FALSE(fs::exists(dir / "out" / "base" / "waveforms.csv"));
  REQUIRE_FALSE(fs::exists(dir / "out" / "base" / "waveforms.cfg"));
  REQUIRE_FALSE(fs::exists(dir / "out" / "summary.json"));
}

// ---- COMTRADE, read back from the field list of C37.111-1999 ------------

struct AnalogChannel {
  int index = 0;
  std::string id, unit;
  double a = 0, b = 0;
  long min = 0, max = 0;
};

TEST_CASE("ComtradeFilesFollowC37111AndReproduceTheCsv", "[outputs][comtrade]") {
  const std::string cfg = Read(RunOnce() / "base" / "waveforms.cfg");
  // Every line ends in CR/LF (C37.111-1999 §5 and §6).
  REQUIRE(cfg.find('\n') != std::string::npos);
  for (std::size_t p = cfg.find('\n'); p != std::string::npos; p = cfg.find('\n', p + 1)) REQUIRE(cfg[p - 1] == '\r');
  std::vector<std::string> lines;
  for (auto& l : Split(cfg, '\n'))
    if (!l.empty()) lines.push_back(l.substr(0, l.size() - 1));

  std::size_t n = 0;
  // Line 1: station_name,rec_dev_id,rev_year.
  auto f = Split(lines[n++], ',');
  REQUIRE(f.size() == 3);
  REQUIRE(f[2] == "1999");
  // Line 2: TT,##A,##D with TT = A + D.
  f = Split(lines[n++], ',');
  REQUIRE(f.size() == 3);
  REQUIRE(f[1].back() == 'A');
  REQUIRE(f[2].back() == 'D');
  const int analog = std::stoi(f[1]), status = std::stoi(f[2]), total = std::stoi(f[0]);
  REQUIRE(total == analog + status);
  REQUIRE(analog == 3);
  // Analog lines: An,ch_id,ph,ccbm,uu,a,b,skew,min,max,primary,secondary,PS.
  std::vector<AnalogChannel> ch;
  for (int k = 0; k < analog; ++k) {
    f = Split(lines[n++], ',');
    REQUIRE(f.size() == 13);
    AnalogChannel c;
    c.index = std::stoi(f[0]);
    REQUIRE(c.index == k + 1);
    c.id = f[1];
    REQUIRE(c.id.size() <= 64);
    c.unit = f[4];
    c.a = std::stod(f[5]);
    c.b = std::stod(f[6]);
    c.min = std::stol(f[8]);
    c.max = std::stol(f[9]);
    REQUIRE(c.min >= -99999);
    REQUIRE(c.max <= 99998);
    REQUIRE((f[12] == "P" || f[12] == "S" || f[12] == "p" || f[12] == "s"));
    ch.push_back(c);
  }
  REQUIRE(ch[0].id == "Vd");
  REQUIRE(ch[0].unit == "V");
  REQUIRE(ch[2].unit == "A");
  // lf, nrates, samp,endsamp, two time stamps, ft, timemult.
  REQUIRE(std::stod(lines[n++]) == 50.0);
  const int nrates = std::stoi(lines[n++]);
  REQUIRE(nrates == 1);
  f = Split(lines[n++], ',');
  const double samp = std::stod(f[0]);
  const long endsamp = std::stol(f[1]);
  const std::regex stamp(R"(\d\d/\d\d/\d{4},\d\d:\d\d:\d\d\.\d{6})");
  REQUIRE(std::regex_match(lines[n++], stamp));
  REQUIRE(std::regex_match(lines[n++], stamp));
  REQUIRE(lines[n++] == "ASCII");
  const double timemult = std::stod(lines[n++]);
  REQUIRE(n == lines.size());

  // The data file: n,timestamp,A1..Ak per row; compare with waveforms.csv.
  const auto dat = Split(Read(RunOnce() / "base" / "waveforms.dat"), '\n');
  const auto csv = Split(Read(RunOnce() / "base" / "waveforms.csv"), '\n');
  long rows = 0;
  for (std::size_t r = 0; r < dat.size(); ++r) {
    if (dat[r].empty()) continue;
    REQUIRE(dat[r].back() == '\r');
    const auto d = Split(dat[r].substr(0, dat[r].size() - 1), ',');
    REQUIRE(d.size() == static_cast<std::size_t>(2 + analog));
    REQUIRE(std::stol(d[0]) == static_cast<long>(r + 1));
    const auto c = Split(csv[r + 1], ',');
    const double t_csv = std::stod(c[0]);
    // Timestamps in µs × timemult; the rate line gives the same instants.
    REQUIRE(std::stol(d[1]) * timemult * 1e-6 == Approx(t_csv).margin(1e-6));
    REQUIRE(r / samp == Approx(t_csv).margin(1e-9));
    for (int k = 0; k < analog; ++k) {
      const long x = std::stol(d[2 + k]);
      REQUIRE(x >= ch[k].min);
      REQUIRE(x <= ch[k].max);
      // Within half a quantisation step (plus the CSV's 9 digits).
      REQUIRE(std::abs(ch[k].a * x + ch[k].b - std::stod(c[1 + k])) <= 0.5 * ch[k].a + 1e-8 * std::abs(std::stod(c[1 + k])) + 1e-12);
    }
    ++rows;
  }
  REQUIRE(rows == endsamp);
}

// ---- SVG -------------------------------------------------------------------

// Decodes an 8-bit RGB or RGBA PNG (non-interlaced) into its pixel bytes.
std::vector<unsigned char> DecodePng(const std::string& png, int* width, int* height, int* channels) {
  REQUIRE(png.compare(0, 8, "\x89PNG\r\n\x1a\n") == 0);
  std::string idat;
  auto be32 = [&](std::size_t p) {
    return (static_cast<unsigned>(static_cast<unsigned char>(png[p])) << 24) |
           (static_cast<unsigned>(static_cast<unsigned char>(png[p + 1])) << 16) |
           (static_cast<unsigned>(static_cast<unsigned char>(png[p + 2])) << 8) |
           static_cast<unsigned>(static_cast<unsigned char>(png[p + 3]));
  };
  for (std::size_t p = 8; p + 8 <= png.size();) {
    const unsigned len = be32(p);
    const std::string type = png.substr(p + 4, 4);
    if (type == "IHDR") {
      *width = static_cast<int>(be32(p + 8));
      *height = static_cast<int>(be32(p + 12));
      REQUIRE(png[p + 16] == 8);  // bit depth
      const int colour = png[p + 17];
      REQUIRE((colour == 2 || colour == 6));
      *channels = colour == 2 ? 3 : 4;
      REQUIRE(png[p + 20] == 0);  // not interlaced
    }
    if (type == "IDAT") idat += png.substr(p + 8, len);
    p += 12 + len;
  }
  const int stride = *width * *channels;
  std::vector<unsigned char> raw(static_cast<std::size_t>(*height) * (stride + 1));
  uLongf size = raw.size();
  REQUIRE(uncompress(raw.data(), &size, reinterpret_cast<const Bytef*>(idat.data()), idat.size()) == Z_OK);
  std::vector<unsigned char> px(static_cast<std::size_t>(*height) * stride);
  const int bpp = *channels;
  for (int y = 0; y < *height; ++y) {
    const unsigned char filter = raw[y * (stride + 1)];
    const unsigned char* in = &raw[y * (stride + 1) + 1];
    unsigned char* out = &px[y * stride];
    const unsigned char* up = y ? &px[(y - 1) * stride] : nullptr;
    for (int i = 0; i < stride; ++i) {
      const int a = i >= bpp ? out[i - bpp] : 0, b = up ? up[i] : 0, c = (up && i >= bpp) ? up[i - bpp] : 0;
      int v = in[i];
      switch (filter) {
        case 1: v += a; break;
        case 2: v += b; break;
        case 3: v += (a + b) / 2; break;
        case 4: {
          const int p = a + b - c, pa = std::abs(p - a), pb = std::abs(p - b), pc = std::abs(p - c);
          v += (pa <= pb && pa <= pc) ? a : (pb <= pc ? b : c);
          break;
        }
        default: break;
      }
      out[i] = static_cast<unsigned char>(v);
    }
  }
  return px;
}

TEST_CASE("TheSvgPlotIsWellFormedAndRendersToANonBlankPicture", "[outputs][svg]") {
  const fs::path svg = RunOnce() / "base" / "waveforms.svg";
  const std::string text = Read(svg);
  REQUIRE(text.find("time [ms]") != std::string::npos);
  REQUIRE(text.find("Vd [V]") != std::string::npos);  // legend with units
  // Well-formed XML (xmllint, Debian libxml2-utils).
  REQUIRE(std::system(("xmllint --noout " + svg.string()).c_str()) == 0);
  // Rendered by rsvg-convert (Debian librsvg2-bin).
  const fs::path png = RunOnce() / "plot.png";
  REQUIRE(std::system(("rsvg-convert -o " + png.string() + " " + svg.string()).c_str()) == 0);
  int w = 0, h = 0, channels = 0;
  const auto px = DecodePng(Read(png), &w, &h, &channels);
  REQUIRE(w == 960);
  long coloured = 0, dark = 0;
  for (std::size_t i = 0; i + channels <= px.size(); i += channels) {
    const int r = px[i], g = px[i + 1], b = px[i + 2];
    const bool opaque = channels == 3 || px[i + 3] > 128;
    if (opaque && std::max({r, g, b}) - std::min({r, g, b}) > 60) ++coloured;  // the traces
    if (opaque && r + g + b < 200) ++dark;                                   // axes and text
  }
  const long total = static_cast<long>(w) * h;
  INFO("coloured " << coloured << ", dark " << dark << " of " << total);
  REQUIRE(coloured > total / 500);
  REQUIRE(dark > total / 500);
}

}  // namespace
}  // namespace lcc
