#include "io/mapped_file.h"

#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <string>
#include <utility>

namespace bw::io {
namespace {

Error os_error(const std::filesystem::path& path, std::string_view what) {
  return Error{"cannot read history file '" + path.string() + "': " + std::string(what) + ": " +
               std::strerror(errno)};
}

// Closes the descriptor on every return path; the mapping outlives it.
class FileDescriptor {
 public:
  explicit FileDescriptor(int fd) : fd_(fd) {}
  FileDescriptor(const FileDescriptor&) = delete;
  FileDescriptor& operator=(const FileDescriptor&) = delete;
  ~FileDescriptor() {
    if (fd_ >= 0) ::close(fd_);
  }
  int get() const { return fd_; }

 private:
  int fd_;
};

}  // namespace

Result<MappedFile> MappedFile::open(const std::filesystem::path& path) {
  const FileDescriptor fd(::open(path.c_str(), O_RDONLY | O_CLOEXEC));
  if (fd.get() < 0) return os_error(path, "open");
  struct stat info {};
  if (::fstat(fd.get(), &info) != 0) return os_error(path, "stat");
  if (!S_ISREG(info.st_mode)) {
    return Error{"cannot read history file '" + path.string() + "': not a regular file"};
  }
  const auto size = static_cast<std::size_t>(info.st_size);
  if (size == 0) return MappedFile(nullptr, 0);
  void* data = ::mmap(nullptr, size, PROT_READ, MAP_PRIVATE, fd.get(), 0);
  if (data == MAP_FAILED) return os_error(path, "mmap");
  // Advice only: a failure changes speed, never the result.
  ::madvise(data, size, MADV_SEQUENTIAL);
  return MappedFile(static_cast<const char*>(data), size);
}

MappedFile::MappedFile(MappedFile&& other) noexcept
    : data_(std::exchange(other.data_, nullptr)), size_(std::exchange(other.size_, 0)) {}

MappedFile& MappedFile::operator=(MappedFile&& other) noexcept {
  MappedFile taken(std::move(other));
  std::swap(data_, taken.data_);
  std::swap(size_, taken.size_);
  return *this;
}

MappedFile::~MappedFile() {
  if (data_ != nullptr) ::munmap(const_cast<char*>(data_), size_);
}

}  // namespace bw::io
