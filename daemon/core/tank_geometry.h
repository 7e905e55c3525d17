// Tank level to liquid volume: barrel constants, vertical cylinders and strapping tables.
//
// Units: levels and diameters in feet, volumes in US oil barrels (bbl: 42 US gallons of 231 in^3,
// so exactly 9702 in^3). Level is the liquid height above the tank's gauge zero.
//
// NaN handling: a NaN level or diameter gives a NaN volume; nothing is clamped silently except by
// StrappingTable, which says so in its answer.
//
// Invariants: a StrappingTable exists only with at least two points, finite values, strictly
// increasing levels and non-decreasing volumes (checked once by StrappingTable::create).
// Everything here is immutable after construction and safe to share between threads.
#pragma once

#include <utility>
#include <vector>

#include "core/result.h"

namespace bw::core {

inline constexpr double kCubicInchesPerBarrel = 42.0 * 231.0;  // = 9702
inline constexpr double kCubicFeetPerBarrel = kCubicInchesPerBarrel / 1728.0;
inline constexpr double kMetresPerInch = 0.0254;
inline constexpr double kCubicMetresPerBarrel =
    kCubicInchesPerBarrel * kMetresPerInch * kMetresPerInch * kMetresPerInch;

// Barrels held by one foot of height of an upright cylinder: (pi D^2 / 4) / 5.614583 ft^3.
double vertical_cylinder_bbl_per_foot(double inside_diameter_ft);

// An upright cylindrical tank with a flat gauge zero. bottom_volume_bbl is the liquid held below
// gauge zero (a sump, a cone bottom, the dead volume under the suction nozzle); it is counted in
// every volume. REQUIRES (asserted): inside_diameter_ft > 0, bottom_volume_bbl >= 0.
struct VerticalCylinder {
  double inside_diameter_ft = 0;
  double bottom_volume_bbl = 0;

  double bbl_per_foot() const { return vertical_cylinder_bbl_per_foot(inside_diameter_ft); }
  // bottom_volume_bbl + level_ft * bbl_per_foot(). Not clamped: a negative level (a transmitter
  // reading below its zero) gives less than the bottom volume, so the fault stays visible.
  double volume_bbl(double level_ft) const;
};

// Where a level lies relative to a strapping table.
enum class TablePosition {
  inside,       // first level <= level <= last level: interpolated
  below_first,  // clamped to the first point's volume
  above_last,   // clamped to the last point's volume
  not_a_number  // the level was NaN; the volume is NaN
};

struct TableVolume {
  double volume_bbl = 0;
  TablePosition position = TablePosition::inside;

  // True when the level was outside the table (or NaN): a template can alert on it.
  bool out_of_table() const { return position != TablePosition::inside; }
};

// Level -> volume by piecewise-linear interpolation over the caller's (level, volume) points, as
// gauged or computed for one tank. Outside the table the volume is clamped to the nearest end and
// the answer says so; the table is never extrapolated.
class StrappingTable {
 public:
  struct Point {
    double level_ft = 0;
    double volume_bbl = 0;
  };

  // Fails, naming the first offending point (0-based), when there are fewer than two points, a
  // value is not finite, levels do not strictly increase or volumes decrease.
  static Result<StrappingTable> create(std::vector<Point> points);

  TableVolume volume_at(double level_ft) const;

  const std::vector<Point>& points() const { return points_; }

 private:
  explicit StrappingTable(std::vector<Point> points) : points_(std::move(points)) {}

  std::vector<Point> points_;
};

}  // namespace bw::core
