// Thin owners of an SQLite connection, a prepared statement and a transaction, with one error
// path: every failure becomes an Error that names the database file, what was being done and
// SQLite's own message.
//
// Only sqlite_handle.cpp and state_store.cpp see sqlite3.h; everything else in brinewatch talks
// to the state store. Values are bound by parameter (never pasted into SQL text).
//
// A connection remembers whether its most recent failure means the file itself is damaged (not
// a database, or a malformed image) as opposed to a passing or environmental problem (locked,
// disk full, permission denied), so the store can tell a file to move aside from one to leave
// alone.
//
// Thread safety: a connection and its statements are used from one thread at a time.
#pragma once

#include <cstdint>
#include <filesystem>
#include <memory>
#include <string>
#include <string_view>
#include <variant>

#include "core/result.h"

struct sqlite3;
struct sqlite3_stmt;

namespace bw::io {

class SqliteStatement;

class SqliteConnection {
 public:
  enum class Mode { open_existing, create_if_missing };

  // Opens `path`. SQLite reads nothing until the first statement, so a damaged file is usually
  // noticed by the first query, not here.
  static Result<std::unique_ptr<SqliteConnection>> open(const std::filesystem::path& path,
                                                        Mode mode);
  // A private database in memory, e.g. to build a reference schema.
  static Result<std::unique_ptr<SqliteConnection>> open_in_memory();

  SqliteConnection(const SqliteConnection&) = delete;
  SqliteConnection& operator=(const SqliteConnection&) = delete;
  ~SqliteConnection();

  // Runs one or more statements without parameters.
  Status exec(std::string_view sql);
  // The first column of the first row of a query (an error when there is no row).
  Result<std::int64_t> query_int(std::string_view sql);
  Result<std::string> query_text(std::string_view sql);

  // An Error "state store '<path>': <doing>: <SQLite's message>" for the connection's most
  // recent failure; also records whether that failure means damage.
  Error fail(std::string_view doing);
  // True when the most recent failure reported through fail() means the file is not a usable
  // database (SQLite's "not a database" or "malformed" codes).
  bool last_failure_means_damage() const { return last_failure_means_damage_; }

  const std::filesystem::path& path() const { return path_; }

 private:
  friend class SqliteStatement;
  friend class SqliteTransaction;

  SqliteConnection(sqlite3* db, std::filesystem::path path) : db_(db), path_(std::move(path)) {}
  Result<SqliteStatement> first_row(std::string_view sql);

  sqlite3* db_;
  std::filesystem::path path_;
  bool last_failure_means_damage_ = false;
};

// A prepared statement. Parameters are numbered from 1, columns from 0. A failed bind is kept
// and reported by the next step(). Move-only; finalized on destruction.
class SqliteStatement {
 public:
  static Result<SqliteStatement> prepare(SqliteConnection& connection, std::string_view sql);

  SqliteStatement(SqliteStatement&& other) noexcept;
  SqliteStatement& operator=(SqliteStatement&&) = delete;
  SqliteStatement(const SqliteStatement&) = delete;
  SqliteStatement& operator=(const SqliteStatement&) = delete;
  ~SqliteStatement();

  void bind_int(int index, std::int64_t value);
  void bind_double(int index, double value);  // NaN is stored by SQLite as NULL
  void bind_null(int index);
  void bind_text(int index, std::string_view value);
  void bind_blob(int index, std::string_view bytes);  // zero bytes stay a zero-length blob

  // true: a row is ready to read; false: the statement has finished.
  Result<bool> step();
  // Makes the statement ready to run again with new parameters.
  void reset();

  bool column_is_null(int column) const;
  std::int64_t column_int(int column) const;
  double column_double(int column) const;
  std::string column_text(int column) const;
  std::string column_blob(int column) const;

 private:
  SqliteStatement(SqliteConnection& connection, sqlite3_stmt* statement)
      : connection_(&connection), statement_(statement) {}
  void note_bind(int code, int index);

  SqliteConnection* connection_;
  sqlite3_stmt* statement_;
  std::string bind_failure_;  // empty while every bind succeeded
};

// BEGIN IMMEDIATE on construction through begin(); rolls back on destruction unless commit()
// succeeded, so an early return leaves nothing behind.
class SqliteTransaction {
 public:
  static Result<SqliteTransaction> begin(SqliteConnection& connection);

  SqliteTransaction(SqliteTransaction&& other) noexcept;
  SqliteTransaction& operator=(SqliteTransaction&&) = delete;
  SqliteTransaction(const SqliteTransaction&) = delete;
  SqliteTransaction& operator=(const SqliteTransaction&) = delete;
  ~SqliteTransaction();

  Status commit();

 private:
  explicit SqliteTransaction(SqliteConnection& connection) : connection_(&connection) {}

  SqliteConnection* connection_;  // null once committed or moved from
};

}  // namespace bw::io
