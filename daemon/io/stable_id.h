// A stable identity for something brinewatch publishes: 16 hex digits of a 64-bit FNV-1a hash
// of its identifying fields, each followed by a separator byte. The same fields give the same id
// live, in replay and when a message is sent again, so consumers can drop duplicates.
#pragma once

#include <cstdint>
#include <cstdio>
#include <string>
#include <string_view>

namespace bw::io {

class StableId {
 public:
  StableId& mix(std::string_view bytes) {
    for (unsigned char c : bytes) step(c);
    step(0xff);  // a separator no text byte sequence can fake across field boundaries
    return *this;
  }
  std::string hex() const {
    char text[17];
    std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(hash_));
    return text;
  }

 private:
  void step(unsigned char c) {
    hash_ ^= c;
    hash_ *= 0x100000001b3ull;
  }
  std::uint64_t hash_ = 0xcbf29ce484222325ull;
};

}  // namespace bw::io
