// Average run lengths of the two-sided tabular CUSUM (k = 0.5, h = 4 and 5, sums starting at 0,
// signal when a sum exceeds h) by Monte Carlo simulation, against
//   - Lucas & Crosier (1982), Technometrics 24:199-205, Table 1 (values as in REFERENCES.md), and
//   - r-cran-spc xcusum.arl(k, h, mu, sided = "two") computed at test time.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "arl_case.h"
#include "core/cusum.h"

namespace bw::core {
namespace {

using test::ArlCase;

struct CusumCase {
  double h;
  double shift;
  double published;  // Lucas & Crosier (1982) Table 1 / REFERENCES.md
};

// Lucas & Crosier (1982) Table 1, two-sided, k = 0.5 (REFERENCES.md).
constexpr CusumCase kCases[] = {
    {4, 0, 167.68}, {4, 0.5, 26.63}, {4, 1, 8.383},  {4, 2, 3.343},
    {5, 0, 465.44}, {5, 0.5, 38.00}, {5, 1, 10.376}, {5, 2, 4.009},
};

const std::vector<ArlCase>& simulated_cases() {
  static const std::vector<ArlCase> cases = [] {
    std::vector<ArlCase> out;
    std::uint64_t seed = 1000;
    for (const CusumCase& c : kCases) {
      const Cusum prototype(CusumParams{.k = 0.5, .h = c.h}, 0, 1);
      ArlCase a;
      a.label = "h=" + test::short_number(c.h) + " shift=" + test::short_number(c.shift);
      a.spc_query = "cusum,0.5," + test::short_number(c.h) + "," + test::short_number(c.shift);
      a.published = c.published;
      a.simulated =
          test::simulate_run_lengths(prototype, c.shift, test::scaled_runs(20000), ++seed);
      out.push_back(a);
    }
    return out;
  }();
  return cases;
}

TEST(CusumArl, SimulationMatchesLucasCrosierTable) {
  test::expect_matches_published(simulated_cases());
}

TEST(CusumArl, SimulationMatchesSpcAtTestTime) {
  BW_REQUIRE_REFERENCE_TOOL(test::rscript_with_spc_available(), "Rscript with r-cran-spc");
  test::expect_matches_spc(simulated_cases());
}

}  // namespace
}  // namespace bw::core
