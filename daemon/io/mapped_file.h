// A read-only view of a whole file's bytes, memory-mapped for the life of the object.
//
// Used for reading large history files without copying them; the view stays valid until the
// object is destroyed. An empty file gives an empty view. Move-only.
//
// Thread safety: the view may be read from any thread; the object itself is not shared.
#pragma once

#include <cstddef>
#include <filesystem>
#include <string_view>

#include "core/result.h"

namespace bw::io {

class MappedFile {
 public:
  // Fails with the path and the operating system's reason (missing, not a regular file, ...).
  static Result<MappedFile> open(const std::filesystem::path& path);

  MappedFile(MappedFile&& other) noexcept;
  MappedFile& operator=(MappedFile&& other) noexcept;
  MappedFile(const MappedFile&) = delete;
  MappedFile& operator=(const MappedFile&) = delete;
  ~MappedFile();

  std::string_view text() const { return {data_, size_}; }

 private:
  MappedFile(const char* data, std::size_t size) : data_(data), size_(size) {}

  const char* data_ = nullptr;  // null exactly when size_ == 0
  std::size_t size_ = 0;
};

}  // namespace bw::io
