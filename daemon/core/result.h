// The one error vocabulary of brinewatch: a value or an Error with a message for a person.
//
// Result<T> holds exactly one of the two. Code on the boundary (files, YAML, network) returns
// Result; exceptions thrown by third-party libraries are caught there and never travel inward.
// Accessing value() of a failed Result (or error() of a good one) is a programming error and
// asserts.
#pragma once

#include <cassert>
#include <string>
#include <utility>
#include <variant>

namespace bw {

struct Error {
  std::string message;
};

template <class T>
class [[nodiscard]] Result {
 public:
  Result(T value) : state_(std::in_place_index<0>, std::move(value)) {}  // NOLINT: implicit by design
  Result(Error error) : state_(std::in_place_index<1>, std::move(error)) {}  // NOLINT

  bool ok() const { return state_.index() == 0; }
  explicit operator bool() const { return ok(); }

  T& value() & {
    assert(ok());
    return std::get<0>(state_);
  }
  const T& value() const& {
    assert(ok());
    return std::get<0>(state_);
  }
  T&& value() && {
    assert(ok());
    return std::get<0>(std::move(state_));
  }
  const Error& error() const {
    assert(!ok());
    return std::get<1>(state_);
  }
  T* operator->() { return &value(); }
  const T* operator->() const { return &value(); }

 private:
  std::variant<T, Error> state_;
};

// For operations that return nothing but may fail.
struct Ok {};
using Status = Result<Ok>;

}  // namespace bw
