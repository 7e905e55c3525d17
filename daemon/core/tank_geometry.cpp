#include "core/tank_geometry.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <numbers>
#include <string>

namespace bw::core {

double vertical_cylinder_bbl_per_foot(double inside_diameter_ft) {
  return std::numbers::pi * inside_diameter_ft * inside_diameter_ft / 4.0 / kCubicFeetPerBarrel;
}

double VerticalCylinder::volume_bbl(double level_ft) const {
  // NaN passes on to the result, as the header promises.
  assert(std::isnan(inside_diameter_ft) || inside_diameter_ft > 0);
  assert(std::isnan(bottom_volume_bbl) || bottom_volume_bbl >= 0);
  return bottom_volume_bbl + level_ft * bbl_per_foot();
}

Result<StrappingTable> StrappingTable::create(std::vector<Point> points) {
  if (points.size() < 2) {
    return Error{"strapping table needs at least 2 points, got " + std::to_string(points.size())};
  }
  for (std::size_t i = 0; i < points.size(); ++i) {
    const Point& p = points[i];
    const std::string where = "strapping table point " + std::to_string(i) + ": ";
    if (!std::isfinite(p.level_ft) || !std::isfinite(p.volume_bbl)) {
      return Error{where + "level and volume must be finite numbers"};
    }
    if (i == 0) continue;
    const Point& before = points[i - 1];
    if (!(p.level_ft > before.level_ft)) {
      return Error{where + "level " + std::to_string(p.level_ft) +
                   " ft is not above the previous level " + std::to_string(before.level_ft) +
                   " ft (levels must strictly increase)"};
    }
    if (p.volume_bbl < before.volume_bbl) {
      return Error{where + "volume " + std::to_string(p.volume_bbl) +
                   " bbl is below the previous volume " + std::to_string(before.volume_bbl) +
                   " bbl (volumes must not decrease)"};
    }
  }
  return StrappingTable(std::move(points));
}

TableVolume StrappingTable::volume_at(double level_ft) const {
  if (std::isnan(level_ft)) {
    return {std::numeric_limits<double>::quiet_NaN(), TablePosition::not_a_number};
  }
  if (level_ft < points_.front().level_ft) {
    return {points_.front().volume_bbl, TablePosition::below_first};
  }
  if (level_ft > points_.back().level_ft) {
    return {points_.back().volume_bbl, TablePosition::above_last};
  }
  // First point strictly above the level; the level lies in [upper - 1, upper]. Only the last
  // level itself has no point above it.
  auto upper = std::upper_bound(points_.begin(), points_.end(), level_ft,
                                [](double level, const Point& p) { return level < p.level_ft; });
  if (upper == points_.end()) return {points_.back().volume_bbl, TablePosition::inside};
  const Point& lo = *(upper - 1);
  const Point& hi = *upper;
  const double share = (level_ft - lo.level_ft) / (hi.level_ft - lo.level_ft);
  return {lo.volume_bbl + share * (hi.volume_bbl - lo.volume_bbl), TablePosition::inside};
}

}  // namespace bw::core
