#include "io/mqtt/decoded_sample.h"

#include <cassert>

namespace bw::io::mqtt {

std::string_view to_string(Rejection reason) {
  switch (reason) {
    case Rejection::unparsable:
      return "unparsable";
    case Rejection::too_large:
      return "too_large";
    case Rejection::not_finite:
      return "not_finite";
    case Rejection::bad_time:
      return "bad_time";
    case Rejection::too_far_in_future:
      return "too_far_in_future";
    case Rejection::too_far_in_past:
      return "too_far_in_past";
    case Rejection::bad_quality:
      return "bad_quality";
    case Rejection::no_tag:
      return "no_tag";
    case Rejection::not_a_number:
      return "not_a_number";
    case Rejection::out_of_sequence:
      return "out_of_sequence";
    case Rejection::not_born:
      return "not_born";
    case Rejection::unknown_metric:
      return "unknown_metric";
  }
  assert(false && "unhandled Rejection");
  return "unknown";
}

void RejectionCounters::add(Rejection reason, std::uint64_t count) {
  const auto index = static_cast<std::size_t>(reason);
  assert(index < kRejectionKinds);
  by_reason[index] += count;
  total += count;
}

std::uint64_t RejectionCounters::count(Rejection reason) const {
  return by_reason[static_cast<std::size_t>(reason)];
}

RejectionCounters& RejectionCounters::operator+=(const RejectionCounters& other) {
  for (std::size_t i = 0; i < kRejectionKinds; ++i) by_reason[i] += other.by_reason[i];
  total += other.total;
  return *this;
}

std::optional<Rejection> check_time_window(core::SensorTime time, core::SensorTime received,
                                           const DecodeLimits& limits) {
  const double ahead_s = core::seconds_between(received, time);
  if (ahead_s > limits.max_future_s) return Rejection::too_far_in_future;
  if (-ahead_s > limits.max_past_s) return Rejection::too_far_in_past;
  return std::nullopt;
}

}  // namespace bw::io::mqtt
