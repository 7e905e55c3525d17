// One periodic record of an asset at run time (site_model.h RecordSpec): accumulates each
// field over the current reporting period and, at the period's end, hands over the record and
// opens the next period.
//
// Time. Values are sample-and-hold: hold() gives a field's latest value and whether its data are
// usable; accumulate(t) adds the held values over [last, t). The owner calls accumulate(t)
// before anything changes at t and hold() after, so each stretch of time is counted once with
// the values that held during it. Stretches in which a field is not usable (bad quality, silent
// input, no value yet) add nothing to that field; `covered_h` counts the time in which every
// field was usable. close() falls due at deadline(), the period's end, whatever samples arrive:
// the owner's deadline mechanism calls it on time, live or in replay.
//
// A field with no usable data in the period reports NaN (null on the wire): max and min when no
// usable value was held, the others when no usable time passed.
//
// Invariants: started() before accumulate/close; accumulate and close see non-decreasing times;
// storage is sized at construction and no update allocates (close builds the record).
// Not thread-safe: owned by the engine's thread.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/sensor_time.h"
#include "engine/asset_record.h"
#include "engine/local_calendar.h"
#include "engine/site_model.h"
#include "engine/state_codec.h"

namespace bw::engine {

class PeriodicRecord {
 public:
  // `units`: per field, the unit of its signal. The spec and calendar outlive this object.
  PeriodicRecord(const RecordSpec& spec, std::vector<std::string> units, LocalCalendar& calendar);

  const RecordSpec& spec() const { return spec_; }
  bool started() const { return period_.has_value(); }
  // Opens the period containing `t`, accumulating from `t`.
  void start(core::SensorTime t);
  // The end of the open period; nullopt before start().
  std::optional<core::SensorTime> deadline() const;

  void accumulate(core::SensorTime t);
  void hold(std::size_t field, double value, bool usable);
  // Accumulates to the period's end, returns its record and opens the next period, in which
  // each field continues with its held value.
  RecordContent close();

  void save(StateWriter& out) const;
  bool load(StateReader& in);

 private:
  struct FieldState {
    double held = 0;
    bool usable = false;
    double integral = 0;  // value * seconds
    double usable_s = 0;
    double above_s = 0;
    double max = 0;
    double min = 0;
    bool seen = false;  // max and min hold a usable value
  };

  void reset_period();
  double result(std::size_t field) const;

  const RecordSpec& spec_;
  std::vector<std::string> units_;
  LocalCalendar& calendar_;
  std::optional<LocalDay> period_;
  core::SensorTime last_{};
  double covered_s_ = 0;
  std::vector<FieldState> fields_;
};

}  // namespace bw::engine
