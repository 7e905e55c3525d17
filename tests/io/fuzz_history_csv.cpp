// libFuzzer entry point for the history reader (built only with clang; see CMakeLists.txt).
//
// Reads the input as history text twice, with and without a time zone (the two paths for
// local times), and aborts when the reader hands out a sample that breaks its promises or
// loses count of the rows.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "io/history_csv.h"

namespace {

class CheckingVisitor final : public bw::io::SampleVisitor {
 public:
  void on_sample(const bw::engine::Sample& s) override {
    if (!std::isfinite(s.value) || s.tag.empty()) std::abort();
    ++count;
  }
  std::size_t count = 0;
};

void read_once(std::string_view text, const char* zone, bool strict) {
  bw::io::HistoryOptions options;
  options.time_zone = zone;
  options.ignore_columns = {"class"};
  options.strict = strict;
  CheckingVisitor visitor;
  const auto stats = bw::io::read_history_text(text, "fuzz", options, visitor);
  if (!stats.ok()) return;
  if (stats->samples != visitor.count) std::abort();
  if (stats->first_problems.size() > options.max_reported_problems) std::abort();
  if (stats->layout == bw::io::HistoryLayout::long_form &&
      stats->samples + stats->rejected + stats->blank_lines + 1 != stats->lines) {
    std::abort();
  }
  if (strict && stats->rejected > 1) std::abort();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  read_once(text, "", false);
  read_once(text, "America/Chicago", size % 2 == 0);
  return 0;
}
