// Strapping table interpolation against numpy, and a cone-bottom table against the geometry it
// was built from.
#include <gtest/gtest.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <numbers>
#include <optional>
#include <vector>

#include "core/tank_geometry.h"
#include "reference_tools.h"

namespace bw::core {
namespace {

using Point = StrappingTable::Point;

// An irregular invented table: a dished bottom, then a shell with a slight taper where the
// gauger's figures change slope.
const std::vector<Point> kIrregular{{0.0, 0.0},     {0.4, 1.7},     {1.1, 12.25},
                                    {2.0, 38.9},    {5.0, 139.7},   {11.5, 358.2},
                                    {17.25, 551.0}, {23.8, 770.45}, {24.0, 777.0}};

TEST(StrappingTableReference, InterpolationMatchesNumpy) {
  const auto python = test::find_python_with_numpy();
  BW_REQUIRE_REFERENCE_TOOL(python.has_value(), "python3 with numpy");
  const auto folder = std::filesystem::path(::testing::TempDir());
  const auto tag = std::to_string(getpid());
  const auto table_csv = folder / ("bw_strap_table_" + tag + ".csv");
  const auto levels_txt = folder / ("bw_strap_levels_" + tag + ".txt");
  std::vector<double> levels;
  // Every point, points nudged either side, a fine sweep, and levels outside at both ends.
  for (const Point& p : kIrregular) {
    for (double d : {-1e-9, 0.0, 1e-9}) levels.push_back(p.level_ft + d);
  }
  for (double level = -1.0; level <= 25.5; level += 0.0625) levels.push_back(level);
  {
    std::ofstream table(table_csv);
    table.precision(17);
    for (const Point& p : kIrregular) table << p.level_ft << ',' << p.volume_bbl << '\n';
    std::ofstream out(levels_txt);
    out.precision(17);
    for (double level : levels) out << level << '\n';
  }
  const auto output = test::run_command(*python + " " + test::tool_path("interpolate.py") + " " +
                                        table_csv.string() + " " + levels_txt.string());
  std::filesystem::remove(table_csv);
  std::filesystem::remove(levels_txt);
  ASSERT_TRUE(output.has_value());
  const auto numpy_volumes = test::parse_numbers(*output);
  ASSERT_TRUE(numpy_volumes.has_value() && numpy_volumes->size() == levels.size()) << *output;

  const auto table = StrappingTable::create(kIrregular);
  ASSERT_TRUE(table.ok()) << table.error().message;
  for (std::size_t i = 0; i < levels.size(); ++i) {
    EXPECT_NEAR(table->volume_at(levels[i]).volume_bbl, (*numpy_volumes)[i], 1e-9)
        << "level " << levels[i] << " ft";
  }
}

// An upright tank of 15.5 ft inside diameter on a cone bottom 1.5 ft deep, gauge zero at the
// apex. Geometry facts: a cone of liquid of depth h in a cone of depth H and radius R has radius
// R h / H and holds pi (R h / H)^2 h / 3; above the cone each foot adds pi R^2. 1 bbl =
// 9702 / 1728 ft^3 (REFERENCES.md "Tanks and volumes").
constexpr double kRadiusFt = 15.5 / 2;
constexpr double kConeDepthFt = 1.5;
constexpr double kFt3PerBarrel = 9702.0 / 1728.0;

double cone_bottom_tank_bbl(double level_ft) {
  const double r2 = kRadiusFt * kRadiusFt;
  if (level_ft <= kConeDepthFt) {
    const double r_at_level = kRadiusFt * level_ft / kConeDepthFt;
    return std::numbers::pi * r_at_level * r_at_level * level_ft / 3 / kFt3PerBarrel;
  }
  return std::numbers::pi * r2 * (kConeDepthFt / 3 + (level_ft - kConeDepthFt)) / kFt3PerBarrel;
}

class ConeBottomTable : public ::testing::Test {
 protected:
  void SetUp() override {
    std::vector<Point> points;
    for (double level = 0; level < kConeDepthFt; level += kStepInCone) {
      points.push_back({level, cone_bottom_tank_bbl(level)});
    }
    for (double level = kConeDepthFt; level <= 24.0; level += 1.0) {
      points.push_back({level, cone_bottom_tank_bbl(level)});
    }
    auto created = StrappingTable::create(points);
    ASSERT_TRUE(created.ok()) << created.error().message;
    table_.emplace(std::move(created).value());
  }
  static constexpr double kStepInCone = 0.25;
  std::optional<StrappingTable> table_;
};

// Above the cone the tank is a cylinder whose volume is linear in level: the table and the
// cylinder with the cone's volume as its bottom volume must agree at every level, between
// points too, and above the top of the table (the last segment extended).
TEST_F(ConeBottomTable, AboveTheConeItAgreesWithTheCylinderEverywhere) {
  const VerticalCylinder shell{.inside_diameter_ft = 2 * kRadiusFt,
                               .bottom_volume_bbl = cone_bottom_tank_bbl(kConeDepthFt)};
  for (double level = kConeDepthFt; level <= 26.0; level += 0.1) {
    EXPECT_NEAR(table_->volume_at(level).volume_bbl, shell.volume_bbl(level - kConeDepthFt), 1e-9)
        << "level " << level << " ft";
  }
  // The cone holds one third of a cylinder of its depth (geometry fact).
  EXPECT_NEAR(cone_bottom_tank_bbl(kConeDepthFt), shell.bbl_per_foot() * kConeDepthFt / 3, 1e-12);
}

// Inside the cone the volume grows with the cube of the level, so straight lines between points
// lie above it (the curve is convex) by at most step^2 / 8 times the largest second derivative
// (the error bound of linear interpolation, common practice in numerical analysis), here
// V'' = 2 pi R^2 h / H^2 <= 2 pi R^2 / H per ft^2.
TEST_F(ConeBottomTable, InsideTheConeInterpolationOverstatesWithinTheBound) {
  const double max_second_derivative =
      2 * std::numbers::pi * kRadiusFt * kRadiusFt / kConeDepthFt / kFt3PerBarrel;
  const double bound = kStepInCone * kStepInCone / 8 * max_second_derivative;
  double largest = 0;
  for (double level = 0; level <= kConeDepthFt; level += 0.01) {
    const double error = table_->volume_at(level).volume_bbl - cone_bottom_tank_bbl(level);
    EXPECT_GE(error, -1e-9) << "level " << level << " ft";
    EXPECT_LE(error, bound) << "level " << level << " ft";
    largest = std::max(largest, error);
  }
  std::printf("  largest overstatement in the cone %.3f bbl, bound %.3f bbl\n", largest, bound);
  // At the table's points the two agree exactly.
  for (const Point& p : table_->points()) {
    EXPECT_NEAR(p.volume_bbl, cone_bottom_tank_bbl(p.level_ft), 1e-12);
  }
}

}  // namespace
}  // namespace bw::core
