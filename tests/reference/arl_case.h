// Test support: one average-run-length case of a two-sided chart, simulated once and compared with
// a published value and with r-cran-spc at test time.
#pragma once

#include <gtest/gtest.h>

#include <cstdio>
#include <string>
#include <vector>

#include "monte_carlo.h"
#include "reference_tools.h"

namespace bw::test {

struct ArlCase {
  std::string label;      // for messages, e.g. "h=4 shift=1"
  std::string spc_query;  // argument for tests/tools/spc_arl.R
  double published = 0;   // value from the published table (REFERENCES.md); 0 = not tabulated
  RunLengthSummary simulated;
};

// A number without trailing zeros, for labels and R arguments (2.814000 -> "2.814").
inline std::string short_number(double v) {
  std::string s = std::to_string(v);
  while (s.back() == '0') s.pop_back();
  if (s.back() == '.') s.pop_back();
  return s;
}

// Tolerance for a simulated mean: 4 standard errors of the mean of the simulated run lengths
// (false alarm rate per comparison ~6e-5 for a normal mean).
inline constexpr double kStandardErrors = 4;

inline void print_case(const ArlCase& c) {
  std::printf("  %-28s simulated %9.3f +/- %6.3f (%d runs), published %9.3f\n", c.label.c_str(),
              c.simulated.mean, c.simulated.standard_error, c.simulated.runs, c.published);
}

inline void expect_matches_published(const std::vector<ArlCase>& cases) {
  for (const ArlCase& c : cases) {
    print_case(c);
    EXPECT_EQ(c.simulated.truncated, 0) << c.label;
    if (c.published == 0) continue;
    EXPECT_NEAR(c.simulated.mean, c.published, kStandardErrors * c.simulated.standard_error)
        << c.label;
  }
}

// Runs spc_arl.R once for all cases; the caller has checked that Rscript with spc exists.
inline void expect_matches_spc(const std::vector<ArlCase>& cases) {
  std::string command = "Rscript " + tool_path("spc_arl.R");
  for (const ArlCase& c : cases) command += " " + c.spc_query;
  const auto output = run_command(command);
  ASSERT_TRUE(output.has_value()) << "failed: " << command;
  const auto values = parse_numbers(*output);
  ASSERT_TRUE(values.has_value()) << "unreadable output: " << *output;
  ASSERT_EQ(values->size(), cases.size());
  for (std::size_t i = 0; i < cases.size(); ++i) {
    const ArlCase& c = cases[i];
    std::printf("  %-28s simulated %9.3f, r-cran-spc %9.3f\n", c.label.c_str(), c.simulated.mean,
                (*values)[i]);
    EXPECT_NEAR(c.simulated.mean, (*values)[i], kStandardErrors * c.simulated.standard_error)
        << c.label;
  }
}

}  // namespace bw::test
