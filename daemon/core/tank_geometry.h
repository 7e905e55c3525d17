// Tank level to liquid volume: barrel constants, vertical cylinders and strapping tables.
//
// Units: levels and diameters in feet, volumes in US oil barrels (bbl: 42 US gallons of 231 in^3,
// so exactly 9702 in^3). Level is the liquid height above the tank's gauge zero.
//
// NaN handling: a NaN level or diameter gives a NaN volume. Nothing is clamped: a level outside
// a strapping table is extrapolated along the nearest end segment, and the answer says so.
//
// Invariants: a StrappingTable exists only with at least two points, finite values, strictly
// increasing levels and non-decreasing volumes (checked once by StrappingTable::create).
// Everything here is immutable after construction and safe to share between threads.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
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
  below_first,  // extrapolated along the first segment
  above_last,   // extrapolated along the last segment
  not_a_number  // the level was NaN; the volume is NaN
};

struct TableVolume {
  double volume_bbl = 0;
  TablePosition position = TablePosition::inside;

  // True when the level was outside the table (or NaN): a template can alert on it.
  bool out_of_table() const { return position != TablePosition::inside; }
};

// Level -> volume by piecewise-linear interpolation over the caller's (level, volume) points, as
// gauged or computed for one tank. Outside the table the end segment is extended in a straight
// line (below the first point along the first segment, above the last along the last) and the
// answer says so. Extending rather than clamping keeps the volume moving with the level: a level
// above the top of the table still raises a fill rate, and a reading below gauge zero gives less
// than the first volume, as VerticalCylinder does, so the fault stays visible. Over a table whose
// end segment is flat the extension is flat too.
class StrappingTable {
 public:
  struct Point {
    double level_ft = 0;
    double volume_bbl = 0;

    friend bool operator==(const Point&, const Point&) = default;
  };

  // Why a list of points is not a table; `point` is the 0-based index of the first offending
  // point (for "too few points", the number of points).
  struct Problem {
    std::size_t point = 0;
    std::string reason;
  };

  // The first problem of `points`, or nothing when they make a table: at least two points, finite
  // values, strictly increasing levels and non-decreasing volumes.
  static std::optional<Problem> find_problem(const std::vector<Point>& points);

  // Fails with the message of find_problem(), naming the point ("strapping table point 2: ...").
  static Result<StrappingTable> create(std::vector<Point> points);

  TableVolume volume_at(double level_ft) const;

  const std::vector<Point>& points() const { return points_; }

  friend bool operator==(const StrappingTable&, const StrappingTable&) = default;

 private:
  explicit StrappingTable(std::vector<Point> points) : points_(std::move(points)) {}

  std::vector<Point> points_;
};

}  // namespace bw::core
