#include "io/sqlite_handle.h"

#include <sqlite3.h>

#include <algorithm>
#include <cassert>
#include <limits>
#include <utility>

namespace bw::io {
namespace {

// SQLite takes lengths as int; state blobs are far below this, and a larger one is refused with
// a clear message instead of being cut short.
constexpr std::size_t kMaxLength = std::numeric_limits<int>::max();

// A migration is many lines of SQL; an error message names it by its first statement's start.
std::string sql_summary(std::string_view sql) {
  constexpr std::size_t kShown = 60;
  const std::size_t start = std::min(sql.find_first_not_of(" \n"), sql.size());
  const std::size_t line_end = std::min(sql.find('\n', start), sql.size());
  const std::string_view line = sql.substr(start, line_end - start);
  if (line.size() <= kShown && line_end == sql.size()) return std::string(line);
  return std::string(line.substr(0, kShown)) + "...";
}

}  // namespace

Result<std::unique_ptr<SqliteConnection>> SqliteConnection::open(const std::filesystem::path& path,
                                                                 Mode mode) {
  int flags = SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOFOLLOW;
  if (mode == Mode::create_if_missing) flags |= SQLITE_OPEN_CREATE;
  sqlite3* db = nullptr;
  const int code = sqlite3_open_v2(path.c_str(), &db, flags, nullptr);
  // SQLite hands back a handle even when opening fails, so that the message can be read from it.
  std::unique_ptr<SqliteConnection> connection(new SqliteConnection(db, path));
  if (code != SQLITE_OK) {
    if (db == nullptr) return Error{"state store '" + path.string() + "': out of memory"};
    return connection->fail("open");
  }
  // Extended codes tell "not a database" apart from other I/O failures.
  sqlite3_extended_result_codes(db, 1);
  return connection;
}

Result<std::unique_ptr<SqliteConnection>> SqliteConnection::open_in_memory() {
  return open(":memory:", Mode::create_if_missing);
}

SqliteConnection::~SqliteConnection() {
  // close_v2 waits for any statement still alive instead of failing.
  sqlite3_close_v2(db_);
}

Error SqliteConnection::fail(std::string_view doing) {
  const int primary = sqlite3_errcode(db_) & 0xff;
  last_failure_means_damage_ = primary == SQLITE_NOTADB || primary == SQLITE_CORRUPT;
  return Error{"state store '" + path_.string() + "': " + std::string(doing) + ": " +
               sqlite3_errmsg(db_)};
}

Status SqliteConnection::exec(std::string_view sql) {
  const std::string text(sql);
  if (sqlite3_exec(db_, text.c_str(), nullptr, nullptr, nullptr) != SQLITE_OK) {
    return fail(sql_summary(sql));
  }
  return Ok{};
}

// Runs `sql` and leaves the statement on its first row; an error when there is none.
Result<SqliteStatement> SqliteConnection::first_row(std::string_view sql) {
  auto statement = SqliteStatement::prepare(*this, sql);
  if (!statement) return statement.error();
  const auto row = statement->step();
  if (!row) return row.error();
  if (!row.value())
    return Error{"state store '" + path_.string() + "': no row from " + std::string(sql)};
  return statement;
}

Result<std::int64_t> SqliteConnection::query_int(std::string_view sql) {
  auto statement = first_row(sql);
  if (!statement) return statement.error();
  return statement->column_int(0);
}

Result<std::string> SqliteConnection::query_text(std::string_view sql) {
  auto statement = first_row(sql);
  if (!statement) return statement.error();
  return statement->column_text(0);
}

Result<SqliteStatement> SqliteStatement::prepare(SqliteConnection& connection,
                                                 std::string_view sql) {
  assert(sql.size() <= kMaxLength);
  sqlite3_stmt* statement = nullptr;
  if (sqlite3_prepare_v2(connection.db_, sql.data(), static_cast<int>(sql.size()), &statement,
                         nullptr) != SQLITE_OK) {
    return connection.fail("prepare " + std::string(sql));
  }
  return SqliteStatement(connection, statement);
}

SqliteStatement::SqliteStatement(SqliteStatement&& other) noexcept
    : connection_(other.connection_),
      statement_(std::exchange(other.statement_, nullptr)),
      bind_failure_(std::move(other.bind_failure_)) {}

SqliteStatement::~SqliteStatement() { sqlite3_finalize(statement_); }

void SqliteStatement::note_bind(int code, int index) {
  if (code != SQLITE_OK && bind_failure_.empty()) {
    bind_failure_ = "parameter " + std::to_string(index) + ": " + sqlite3_errstr(code);
  }
}

void SqliteStatement::bind_int(int index, std::int64_t value) {
  note_bind(sqlite3_bind_int64(statement_, index, value), index);
}

void SqliteStatement::bind_double(int index, double value) {
  note_bind(sqlite3_bind_double(statement_, index, value), index);
}

void SqliteStatement::bind_null(int index) {
  note_bind(sqlite3_bind_null(statement_, index), index);
}

void SqliteStatement::bind_text(int index, std::string_view value) {
  if (value.size() > kMaxLength) return note_bind(SQLITE_TOOBIG, index);
  note_bind(sqlite3_bind_text(statement_, index, value.data(), static_cast<int>(value.size()),
                              SQLITE_TRANSIENT),
            index);
}

void SqliteStatement::bind_blob(int index, std::string_view bytes) {
  if (bytes.size() > kMaxLength) return note_bind(SQLITE_TOOBIG, index);
  // bind_blob with a null pointer would store NULL; zeroblob keeps an empty state a blob.
  const int code = bytes.empty()
                       ? sqlite3_bind_zeroblob(statement_, index, 0)
                       : sqlite3_bind_blob(statement_, index, bytes.data(),
                                           static_cast<int>(bytes.size()), SQLITE_TRANSIENT);
  note_bind(code, index);
}

Result<bool> SqliteStatement::step() {
  if (!bind_failure_.empty()) {
    return Error{"state store '" + connection_->path().string() + "': " + sqlite3_sql(statement_) +
                 ": " + bind_failure_};
  }
  const int code = sqlite3_step(statement_);
  if (code == SQLITE_ROW) return true;
  if (code == SQLITE_DONE) return false;
  return connection_->fail(sqlite3_sql(statement_));
}

void SqliteStatement::reset() {
  sqlite3_reset(statement_);
  sqlite3_clear_bindings(statement_);
  bind_failure_.clear();
}

bool SqliteStatement::column_is_null(int column) const {
  return sqlite3_column_type(statement_, column) == SQLITE_NULL;
}

std::int64_t SqliteStatement::column_int(int column) const {
  return sqlite3_column_int64(statement_, column);
}

double SqliteStatement::column_double(int column) const {
  return sqlite3_column_double(statement_, column);
}

std::string SqliteStatement::column_text(int column) const {
  const auto* text = sqlite3_column_text(statement_, column);
  const auto size = static_cast<std::size_t>(sqlite3_column_bytes(statement_, column));
  return text == nullptr ? std::string() : std::string(reinterpret_cast<const char*>(text), size);
}

std::string SqliteStatement::column_blob(int column) const {
  const void* bytes = sqlite3_column_blob(statement_, column);
  const auto size = static_cast<std::size_t>(sqlite3_column_bytes(statement_, column));
  return bytes == nullptr ? std::string() : std::string(static_cast<const char*>(bytes), size);
}

Result<SqliteTransaction> SqliteTransaction::begin(SqliteConnection& connection) {
  // IMMEDIATE takes the write lock now, so a busy database is met here (and waited for under
  // the busy timeout) rather than half-way through the batch.
  auto begun = connection.exec("BEGIN IMMEDIATE");
  if (!begun) return begun.error();
  return SqliteTransaction(connection);
}

SqliteTransaction::SqliteTransaction(SqliteTransaction&& other) noexcept
    : connection_(std::exchange(other.connection_, nullptr)) {}

SqliteTransaction::~SqliteTransaction() {
  // SQLite may already have rolled back on its own (e.g. after an I/O error); then this fails
  // harmlessly.
  if (connection_ != nullptr) sqlite3_exec(connection_->db_, "ROLLBACK", nullptr, nullptr, nullptr);
}

Status SqliteTransaction::commit() {
  assert(connection_ != nullptr);
  auto committed = connection_->exec("COMMIT");
  if (committed) connection_ = nullptr;
  return committed;
}

}  // namespace bw::io
