#include "io/state_files.h"

#include <fcntl.h>
#include <unistd.h>

#include <array>
#include <cassert>
#include <cerrno>
#include <cstring>
#include <ctime>
#include <fstream>
#include <system_error>
#include <utility>

namespace bw::io {
namespace {

namespace fs = std::filesystem;

Error file_error(const fs::path& path, std::string_view doing, const std::error_code& code) {
  return Error{"state store '" + path.string() + "': " + std::string(doing) + ": " +
               code.message()};
}

std::string utc_stamp(std::chrono::system_clock::time_point now) {
  const std::time_t seconds = std::chrono::system_clock::to_time_t(now);
  std::tm utc{};
  gmtime_r(&seconds, &utc);
  std::array<char, 32> text{};
  const std::size_t n = std::strftime(text.data(), text.size(), "%Y%m%dT%H%M%SZ", &utc);
  return std::string(text.data(), n);
}

}  // namespace

StateFiles StateFiles::in(const fs::path& dir, const std::string& file_name) {
  const fs::path database = dir / file_name;
  return {database, fs::path(database.string() + "-wal"), fs::path(database.string() + "-shm")};
}

Status ensure_state_directory(const fs::path& dir) {
  std::error_code code;
  if (fs::is_directory(dir, code)) return Ok{};
  if (!fs::create_directories(dir, code) && code) {
    return file_error(dir, "create state directory", code);
  }
  fs::permissions(dir, fs::perms::owner_all, fs::perm_options::replace, code);
  if (code) return file_error(dir, "set mode 0700 on state directory", code);
  return Ok{};
}

Result<bool> wal_header_plausible(const fs::path& wal) {
  std::error_code code;
  if (!fs::exists(wal, code)) return true;
  const auto size = fs::file_size(wal, code);
  if (code) return file_error(wal, "size of write-ahead log", code);
  // An empty log is what SQLite leaves after a checkpoint that truncated it.
  if (size == 0) return true;
  std::ifstream in(wal, std::ios::binary);
  std::array<unsigned char, 4> magic{};
  if (!in.read(reinterpret_cast<char*>(magic.data()), magic.size())) return false;
  const std::uint32_t value = (std::uint32_t{magic[0]} << 24) | (std::uint32_t{magic[1]} << 16) |
                              (std::uint32_t{magic[2]} << 8) | std::uint32_t{magic[3]};
  return value == 0x377f0682u || value == 0x377f0683u;
}

Result<std::filesystem::path> move_aside(const StateFiles& files, MoveAside which,
                                         std::chrono::system_clock::time_point now) {
  std::vector<std::pair<fs::path, std::string>> chosen = {{files.wal, "-wal"}, {files.shm, "-shm"}};
  if (which == MoveAside::database_and_companions)
    chosen.insert(chosen.begin(), {files.database, ""});
  std::error_code code;
  std::erase_if(chosen, [&](const auto& file) { return !fs::exists(file.first, code); });
  assert(!chosen.empty());

  // Two damaged files within one second must not overwrite each other.
  const std::string stem = files.database.string() + ".damaged-" + utc_stamp(now);
  std::string target = stem;
  for (int n = 2;; ++n) {
    bool taken = false;
    for (const auto& file : chosen) taken = taken || fs::exists(target + file.second, code);
    if (!taken) break;
    target = stem + "-" + std::to_string(n);
  }

  for (const auto& [from, suffix] : chosen) {
    fs::rename(from, target + suffix, code);
    if (code) return file_error(from, "move aside to '" + target + suffix + "'", code);
  }
  auto synced = sync_directory(files.database.parent_path());
  if (!synced) return synced.error();
  return fs::path(target + chosen.front().second);
}

Status sync_directory(const fs::path& dir) {
  const int fd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (fd < 0 || ::fsync(fd) != 0) {
    const std::error_code code(errno, std::generic_category());
    if (fd >= 0) ::close(fd);
    return file_error(dir, "sync directory", code);
  }
  ::close(fd);
  return Ok{};
}

}  // namespace bw::io
