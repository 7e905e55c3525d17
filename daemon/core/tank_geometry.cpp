#include "core/tank_geometry.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <cstdio>
#include <limits>
#include <numbers>
#include <string>

namespace bw::core {
namespace {

// A number for messages: up to 10 significant digits, no trailing zeros.
std::string format_value(double value) {
  char text[32];
  std::snprintf(text, sizeof text, "%.10g", value);
  return text;
}

}  // namespace

double vertical_cylinder_bbl_per_foot(double inside_diameter_ft) {
  return std::numbers::pi * inside_diameter_ft * inside_diameter_ft / 4.0 / kCubicFeetPerBarrel;
}

double VerticalCylinder::volume_bbl(double level_ft) const {
  // NaN passes on to the result, as the header promises.
  assert(std::isnan(inside_diameter_ft) || inside_diameter_ft > 0);
  assert(std::isnan(bottom_volume_bbl) || bottom_volume_bbl >= 0);
  return bottom_volume_bbl + level_ft * bbl_per_foot();
}

std::optional<StrappingTable::Problem> StrappingTable::find_problem(
    const std::vector<Point>& points) {
  if (points.size() < 2) {
    return Problem{points.size(), "needs at least 2 points, got " + std::to_string(points.size())};
  }
  for (std::size_t i = 0; i < points.size(); ++i) {
    const Point& p = points[i];
    if (!std::isfinite(p.level_ft) || !std::isfinite(p.volume_bbl)) {
      return Problem{i, "level and volume must be finite numbers"};
    }
    if (i == 0) continue;
    const Point& before = points[i - 1];
    if (!(p.level_ft > before.level_ft)) {
      return Problem{i, "level " + format_value(p.level_ft) +
                            " ft is not above the previous level " + format_value(before.level_ft) +
                            " ft (levels must strictly increase)"};
    }
    if (p.volume_bbl < before.volume_bbl) {
      return Problem{i, "volume " + format_value(p.volume_bbl) +
                            " bbl is below the previous volume " + format_value(before.volume_bbl) +
                            " bbl (volumes must not decrease)"};
    }
  }
  return std::nullopt;
}

Result<StrappingTable> StrappingTable::create(std::vector<Point> points) {
  if (auto problem = find_problem(points)) {
    if (points.size() < 2) return Error{"strapping table " + problem->reason};
    return Error{"strapping table point " + std::to_string(problem->point) + ": " +
                 problem->reason};
  }
  return StrappingTable(std::move(points));
}

TableVolume StrappingTable::volume_at(double level_ft) const {
  if (std::isnan(level_ft)) {
    return {std::numeric_limits<double>::quiet_NaN(), TablePosition::not_a_number};
  }
  // The segment [lo, hi] that holds the level, or the end segment nearest to it.
  auto upper = std::upper_bound(points_.begin(), points_.end(), level_ft,
                                [](double level, const Point& p) { return level < p.level_ft; });
  TablePosition position = TablePosition::inside;
  if (upper == points_.begin()) {
    position = TablePosition::below_first;
    upper = points_.begin() + 1;
  } else if (upper == points_.end()) {
    // At the last level itself the answer is exact; only above it is extrapolated.
    if (level_ft > points_.back().level_ft) position = TablePosition::above_last;
    upper = points_.end() - 1;
  }
  const Point& lo = *(upper - 1);
  const Point& hi = *upper;
  const double share = (level_ft - lo.level_ft) / (hi.level_ft - lo.level_ft);
  return {lo.volume_bbl + share * (hi.volume_bbl - lo.volume_bbl), position};
}

}  // namespace bw::core
