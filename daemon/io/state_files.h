// The files of the state store on disk, and the moves that keep a damaged one for a person to
// look at instead of deleting it. Used by StateStore::open; no SQLite here.
//
// Thread safety: free functions over the file system; two processes moving the same files at
// once is not supported (the daemon runs once per state directory).
#pragma once

#include <chrono>
#include <filesystem>
#include <string>
#include <vector>

#include "core/result.h"
#include "io/sqlite_handle.h"

namespace bw::io {

// A database and the two companion files SQLite keeps beside it in WAL mode.
struct StateFiles {
  std::filesystem::path database, wal, shm;

  static StateFiles in(const std::filesystem::path& dir, const std::string& file_name);
};

// Creates `dir` with mode 0700 when it does not exist; an existing directory is left as it is.
Status ensure_state_directory(const std::filesystem::path& dir);

// False when `wal` exists, is not empty, and does not begin with a WAL header's magic number
// (0x377f0682 or 0x377f0683, big-endian: SQLite file format, "The WAL File Format"; from
// memory). SQLite itself silently ignores such a log.
Result<bool> wal_header_plausible(const std::filesystem::path& wal);

// Which of a store's files to move aside.
enum class MoveAside { database_and_companions, companions_only };

// Renames the existing files among `files` to <database>.damaged-YYYYMMDDTHHMMSSZ, with "-wal"
// and "-shm" appended for the companions (and "-2", "-3"... before those when the name is
// taken), then syncs the directory so the rename survives a power loss. Returns the new path of
// the first file moved (the database, else the log, else the shared-memory file). Fails, moving
// nothing more, on the first rename that fails; it is an error to call this when none of the
// chosen files exists.
Result<std::filesystem::path> move_aside(const StateFiles& files, MoveAside which,
                                         std::chrono::system_clock::time_point now);

// fsync of a directory, so that a file created or renamed in it stays after a power loss.
Status sync_directory(const std::filesystem::path& dir);

}  // namespace bw::io
