#include "io/state_store.h"

#include <algorithm>
#include <array>
#include <cassert>
#include <chrono>
#include <limits>
#include <system_error>

#include "io/sqlite_handle.h"
#include "io/state_files.h"
#include "io/state_schema.h"

namespace bw::io {
namespace {

namespace fs = std::filesystem;
using state_schema::kCurrentVersion;
using state_schema::kMigrations;

// Long enough to ride out an offline dump reading the file, short enough that a stuck lock is
// reported rather than hanging the daemon.
constexpr int kBusyTimeoutMs = 5000;

// The text columns of the journal, in table order after seq and time_us; value comes last.
constexpr std::array<std::string JournalEntry::*, 13> kJournalText = {
    &JournalEntry::site,     &JournalEntry::asset,      &JournalEntry::check,
    &JournalEntry::event,    &JournalEntry::from_state, &JournalEntry::to_state,
    &JournalEntry::priority, &JournalEntry::cause,      &JournalEntry::who,
    &JournalEntry::reason,   &JournalEntry::source,     &JournalEntry::tag,
    &JournalEntry::message};
constexpr int kJournalValueColumn = 2 + static_cast<int>(kJournalText.size());

constexpr const char* kJournalColumns =
    "seq, time_us, site, asset, check_name, event, from_state, to_state, priority, cause, who, "
    "reason, source, tag, message, value";

// What the examination of an existing file found: its version, and when it must be moved aside,
// why.
struct Examination {
  int version = 0;
  std::string damage;
};

Status run_to_end(SqliteStatement& statement) {
  auto row = statement.step();
  statement.reset();
  if (!row) return row.error();
  return Ok{};
}

Status set_connection_options(SqliteConnection& db) {
  auto mode = db.query_text("PRAGMA journal_mode = WAL");
  if (!mode) return mode.error();
  if (mode.value() != "wal") {
    return Error{"state store '" + db.path().string() +
                 "': cannot switch to write-ahead logging (journal mode stays '" + mode.value() +
                 "'); is the state directory on a local file system?"};
  }
  // FULL: in WAL mode NORMAL may lose the last commits on a power loss; FULL may not.
  auto set = db.exec("PRAGMA synchronous = FULL; PRAGMA foreign_keys = ON");
  if (!set) return set.error();
  return Ok{};
}

// Names of the tables and indexes of a database, each table with its columns, e.g.
// "table journal(seq,time_us,...)", "index journal_by_alert".
Result<std::vector<std::string>> schema_outline(SqliteConnection& db) {
  auto objects = SqliteStatement::prepare(
      db,
      "SELECT type, name FROM sqlite_master WHERE type IN ('table', 'index') AND name NOT LIKE "
      "'sqlite_%' ORDER BY type, name");
  if (!objects) return objects.error();
  auto columns =
      SqliteStatement::prepare(db, "SELECT name FROM pragma_table_info(?1) ORDER BY cid");
  if (!columns) return columns.error();
  std::vector<std::string> outline;
  for (;;) {
    auto row = objects->step();
    if (!row) return row.error();
    if (!row.value()) break;
    const std::string type = objects->column_text(0);
    std::string entry = type + " " + objects->column_text(1);
    if (type == "table") {
      columns->bind_text(1, objects->column_text(1));
      std::string names;
      for (;;) {
        auto column = columns->step();
        if (!column) return column.error();
        if (!column.value()) break;
        names += (names.empty() ? "" : ",") + columns->column_text(0);
      }
      columns->reset();
      entry += "(" + names + ")";
    }
    outline.push_back(std::move(entry));
  }
  return outline;
}

Status migrate(SqliteConnection& db, int from) {
  for (int version = from; version < kCurrentVersion; ++version) {
    auto transaction = SqliteTransaction::begin(db);
    if (!transaction) return transaction.error();
    auto applied = db.exec(kMigrations[static_cast<std::size_t>(version)]);
    if (!applied) return applied.error();
    auto bumped = db.exec("PRAGMA user_version = " + std::to_string(version + 1));
    if (!bumped) return bumped.error();
    auto committed = transaction->commit();
    if (!committed) return committed.error();
  }
  return Ok{};
}

// The difference between the file's schema and the one its version promises: "" when every
// table (with its columns, in order) and index of that version is there. Extra objects are
// tolerated at versions >= 1; at version 0 any object means the file belongs to someone else.
Result<std::string> schema_mismatch(SqliteConnection& db, int version) {
  auto found = schema_outline(db);
  if (!found) return found.error();
  if (version == 0) {
    if (found->empty()) return std::string();
    return "holds " + std::to_string(found->size()) +
           " tables or indexes but no brinewatch schema version (first: " + found->front() + ")";
  }
  // The reference is built from the same migrations, stopped at the file's version.
  assert(version <= kCurrentVersion);
  auto reference_db = SqliteConnection::open_in_memory();
  if (!reference_db) return reference_db.error();
  for (int v = 0; v < version; ++v) {
    auto applied = reference_db.value()->exec(kMigrations[static_cast<std::size_t>(v)]);
    if (!applied) return applied.error();
  }
  auto expected = schema_outline(*reference_db.value());
  if (!expected) return expected.error();
  std::string missing;
  for (const std::string& entry : expected.value()) {
    if (std::find(found->begin(), found->end(), entry) == found->end()) {
      missing += (missing.empty() ? "" : "; ") + entry;
    }
  }
  if (missing.empty()) return missing;
  return "schema version " + std::to_string(version) + " but missing or different: " + missing;
}

// Reads the file without changing it, then decides. Failures that mean damage become findings;
// others (locked, unreadable) stay errors.
Result<Examination> examine(SqliteConnection& db) {
  Examination found;
  const auto damage_or_error = [&](const Error& error) -> Result<Examination> {
    if (!db.last_failure_means_damage()) return error;
    found.damage = error.message;
    return found;
  };
  auto timeout = db.exec("PRAGMA busy_timeout = " + std::to_string(kBusyTimeoutMs));
  if (!timeout) return timeout.error();
  auto version = db.query_int("PRAGMA user_version");
  if (!version) return damage_or_error(version.error());
  if (version.value() > kCurrentVersion || version.value() < 0) {
    return Error{"state store '" + db.path().string() + "' has schema version " +
                 std::to_string(version.value()) +
                 ", written by a newer brinewatch; this one knows " + "versions up to " +
                 std::to_string(kCurrentVersion) +
                 ". Upgrade brinewatch, or move the file away to start with an empty state."};
  }
  found.version = static_cast<int>(version.value());
  auto check = db.query_text("PRAGMA quick_check(1)");
  if (!check) return damage_or_error(check.error());
  if (check.value() != "ok") {
    found.damage = "PRAGMA quick_check found a problem: " + check.value();
    return found;
  }
  auto mismatch = schema_mismatch(db, found.version);
  if (!mismatch) return damage_or_error(mismatch.error());
  found.damage = std::move(mismatch.value());
  return found;
}

// Opens an existing database, or tells why it must be moved aside (connection null then).
struct Opened {
  std::unique_ptr<SqliteConnection> connection;
  Examination examination;
};

Result<Opened> open_existing(const fs::path& database) {
  auto db = SqliteConnection::open(database, SqliteConnection::Mode::open_existing);
  if (!db) return db.error();
  auto examination = examine(*db.value());
  if (!examination) return examination.error();
  if (!examination->damage.empty()) return Opened{nullptr, std::move(examination.value())};
  return Opened{std::move(db.value()), std::move(examination.value())};
}

Result<std::unique_ptr<SqliteConnection>> create_new(const StateFiles& files) {
  auto db = SqliteConnection::open(files.database, SqliteConnection::Mode::create_if_missing);
  if (!db) return db.error();
  auto timeout = db.value()->exec("PRAGMA busy_timeout = " + std::to_string(kBusyTimeoutMs));
  if (!timeout) return timeout.error();
  return db;
}

}  // namespace

Result<std::unique_ptr<StateStore>> StateStore::open(const fs::path& dir, StoreOpenReport& report) {
  report = StoreOpenReport{};
  auto directory = ensure_state_directory(dir);
  if (!directory) return directory.error();
  const StateFiles files = StateFiles::in(dir, kFileName);
  const auto now = std::chrono::system_clock::now();
  std::error_code code;

  std::unique_ptr<SqliteConnection> db;
  if (fs::exists(files.database, code)) {
    auto plausible = wal_header_plausible(files.wal);
    if (!plausible) return plausible.error();
    if (!plausible.value()) {
      auto moved = move_aside(files, MoveAside::companions_only, now);
      if (!moved) return moved.error();
      report.moved_aside = moved.value();
      report.problem = "the write-ahead log '" + files.wal.string() +
                       "' did not begin with a write-ahead log header; the database was kept "
                       "with what it held at its last checkpoint, later commits are lost";
    }
    auto opened = open_existing(files.database);
    if (!opened) return opened.error();
    if (opened->connection == nullptr) {
      // The file is damaged: keep it for a person, start afresh.
      auto moved = move_aside(files, MoveAside::database_and_companions, now);
      if (!moved) return moved.error();
      report.moved_aside = moved.value();
      if (!report.problem.empty()) report.problem += "; then ";
      report.problem += std::move(opened->examination.damage);
    } else {
      db = std::move(opened->connection);
      report.migrated_from = opened->examination.version;
    }
  } else if (fs::exists(files.wal, code) || fs::exists(files.shm, code)) {
    // A log replayed into a new, empty database would bring back pages of some other file.
    auto moved = move_aside(files, MoveAside::companions_only, now);
    if (!moved) return moved.error();
    report.moved_aside = moved.value();
    report.problem = "a write-ahead log or shared-memory file was found without its database";
  }

  const bool fresh = db == nullptr;
  if (fresh) {
    auto created = create_new(files);
    if (!created) return created.error();
    db = std::move(created.value());
  }
  auto options = set_connection_options(*db);
  if (!options) return options.error();
  auto migrated = migrate(*db, report.migrated_from);
  if (!migrated) return migrated.error();
  if (fresh) {
    auto synced = sync_directory(dir);
    if (!synced) return synced.error();
  }
  report.created = report.migrated_from == 0;
  report.schema_version = kCurrentVersion;
  return std::unique_ptr<StateStore>(new StateStore(std::move(db)));
}

StateStore::StateStore(std::unique_ptr<SqliteConnection> connection)
    : connection_(std::move(connection)) {}

StateStore::~StateStore() = default;

const fs::path& StateStore::path() const { return connection_->path(); }

Result<std::int64_t> StateStore::last_seq() const {
  return connection_->query_int("SELECT coalesce(max(seq), 0) FROM journal");
}

Result<std::int64_t> StateStore::commit(const Batch& batch) {
  SqliteConnection& db = *connection_;
  auto transaction = SqliteTransaction::begin(db);
  if (!transaction) return transaction.error();
  // Read inside the transaction: the write lock is held, so no one else appends meanwhile.
  auto last = last_seq();
  if (!last) return last.error();
  std::int64_t seq = last.value();

  if (!batch.journal.empty()) {
    auto insert = SqliteStatement::prepare(
        db, std::string("INSERT INTO journal (") + kJournalColumns +
                ") VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16)");
    if (!insert) return insert.error();
    for (const JournalEntry& entry : batch.journal) {
      insert->bind_int(1, ++seq);
      insert->bind_int(2, entry.time_us);
      for (std::size_t i = 0; i < kJournalText.size(); ++i) {
        insert->bind_text(3 + static_cast<int>(i), entry.*kJournalText[i]);
      }
      if (entry.value) {
        insert->bind_double(kJournalValueColumn + 1, *entry.value);
      } else {
        insert->bind_null(kJournalValueColumn + 1);
      }
      auto done = run_to_end(insert.value());
      if (!done) return done.error();
    }
  }
  if (!batch.alerts.empty()) {
    auto upsert = SqliteStatement::prepare(
        db,
        "INSERT INTO alert_state (asset, check_name, state) VALUES (?1, ?2, ?3) "
        "ON CONFLICT (asset, check_name) DO UPDATE SET state = excluded.state");
    if (!upsert) return upsert.error();
    for (const AlertRecord& alert : batch.alerts) {
      upsert->bind_text(1, alert.asset);
      upsert->bind_text(2, alert.check);
      upsert->bind_blob(3, alert.state);
      auto done = run_to_end(upsert.value());
      if (!done) return done.error();
    }
  }
  if (!batch.checkpoints.empty()) {
    auto upsert = SqliteStatement::prepare(
        db,
        "INSERT INTO checkpoint (scope, definition_hash, taken_at_us, state) "
        "VALUES (?1, ?2, ?3, ?4) ON CONFLICT (scope) DO UPDATE SET "
        "definition_hash = excluded.definition_hash, taken_at_us = excluded.taken_at_us, "
        "state = excluded.state");
    if (!upsert) return upsert.error();
    for (const Checkpoint& checkpoint : batch.checkpoints) {
      upsert->bind_text(1, checkpoint.scope);
      upsert->bind_text(2, checkpoint.definition_hash);
      upsert->bind_int(3, checkpoint.taken_at_us);
      upsert->bind_blob(4, checkpoint.state);
      auto done = run_to_end(upsert.value());
      if (!done) return done.error();
    }
  }
  if (!batch.meta.empty()) {
    auto upsert =
        SqliteStatement::prepare(db,
                                 "INSERT INTO meta (key, value) VALUES (?1, ?2) "
                                 "ON CONFLICT (key) DO UPDATE SET value = excluded.value");
    if (!upsert) return upsert.error();
    for (const auto& [key, value] : batch.meta) {
      upsert->bind_text(1, key);
      upsert->bind_text(2, value);
      auto done = run_to_end(upsert.value());
      if (!done) return done.error();
    }
  }
  if (!batch.outbox.empty()) {
    auto insert = SqliteStatement::prepare(
        db, "INSERT INTO outbox (topic, payload, qos, retained, created_us) "
            "VALUES (?1, ?2, ?3, ?4, ?5)");
    if (!insert) return insert.error();
    for (const OutboxMessage& message : batch.outbox) {
      insert->bind_text(1, message.topic);
      insert->bind_blob(2, message.payload);
      insert->bind_int(3, message.qos);
      insert->bind_int(4, message.retained ? 1 : 0);
      insert->bind_int(5, message.created_us);
      auto done = run_to_end(insert.value());
      if (!done) return done.error();
    }
  }
  if (!batch.delivered.empty()) {
    auto remove = SqliteStatement::prepare(db, "DELETE FROM outbox WHERE id = ?1");
    if (!remove) return remove.error();
    for (std::int64_t id : batch.delivered) {
      remove->bind_int(1, id);
      auto done = run_to_end(remove.value());
      if (!done) return done.error();
    }
  }
  auto committed = transaction->commit();
  if (!committed) return committed.error();
  return seq;
}

Result<std::vector<OutboxMessage>> StateStore::read_outbox(std::int64_t after_id,
                                                           std::size_t limit) const {
  auto select = SqliteStatement::prepare(
      *connection_,
      "SELECT id, topic, payload, qos, retained, created_us FROM outbox WHERE id > ?1 "
      "ORDER BY id LIMIT ?2");
  if (!select) return select.error();
  select->bind_int(1, after_id);
  constexpr auto kNoLimit = static_cast<std::size_t>(std::numeric_limits<std::int64_t>::max());
  select->bind_int(2, static_cast<std::int64_t>(std::min(limit, kNoLimit)));
  std::vector<OutboxMessage> messages;
  for (;;) {
    auto row = select->step();
    if (!row) return row.error();
    if (!row.value()) return messages;
    messages.push_back({select->column_int(0), select->column_text(1), select->column_blob(2),
                        static_cast<int>(select->column_int(3)), select->column_int(4) != 0,
                        select->column_int(5)});
  }
}

Result<std::vector<AlertRecord>> StateStore::load_alerts() const {
  auto select = SqliteStatement::prepare(
      *connection_, "SELECT asset, check_name, state FROM alert_state ORDER BY asset, check_name");
  if (!select) return select.error();
  std::vector<AlertRecord> alerts;
  for (;;) {
    auto row = select->step();
    if (!row) return row.error();
    if (!row.value()) return alerts;
    alerts.push_back({select->column_text(0), select->column_text(1), select->column_blob(2)});
  }
}

Result<std::vector<Checkpoint>> StateStore::load_checkpoints() const {
  auto select = SqliteStatement::prepare(
      *connection_,
      "SELECT scope, definition_hash, taken_at_us, state FROM checkpoint ORDER BY scope");
  if (!select) return select.error();
  std::vector<Checkpoint> checkpoints;
  for (;;) {
    auto row = select->step();
    if (!row) return row.error();
    if (!row.value()) return checkpoints;
    checkpoints.push_back({select->column_text(0), select->column_text(1), select->column_int(2),
                           select->column_blob(3)});
  }
}

namespace {

// Every row `select` (over kJournalColumns) yields, as journal entries.
Result<std::vector<JournalEntry>> journal_rows(SqliteStatement& select) {
  std::vector<JournalEntry> entries;
  for (;;) {
    auto row = select.step();
    if (!row) return row.error();
    if (!row.value()) return entries;
    JournalEntry& entry = entries.emplace_back();
    entry.seq = select.column_int(0);
    entry.time_us = select.column_int(1);
    for (std::size_t i = 0; i < kJournalText.size(); ++i) {
      entry.*kJournalText[i] = select.column_text(2 + static_cast<int>(i));
    }
    if (!select.column_is_null(kJournalValueColumn)) {
      entry.value = select.column_double(kJournalValueColumn);
    }
  }
}

}  // namespace

Result<std::vector<JournalEntry>> StateStore::read_journal(std::int64_t after_seq,
                                                           std::size_t limit) const {
  auto select = SqliteStatement::prepare(*connection_,
                                         std::string("SELECT ") + kJournalColumns +
                                             " FROM journal WHERE seq > ?1 ORDER BY seq LIMIT ?2");
  if (!select) return select.error();
  select->bind_int(1, after_seq);
  constexpr auto kNoLimit = static_cast<std::size_t>(std::numeric_limits<std::int64_t>::max());
  select->bind_int(2, static_cast<std::int64_t>(std::min(limit, kNoLimit)));
  return journal_rows(select.value());
}

Result<std::vector<JournalEntry>> StateStore::latest_per_alert() const {
  // The journal_by_alert index serves the grouping.
  auto select = SqliteStatement::prepare(
      *connection_, std::string("SELECT ") + kJournalColumns +
                        " FROM journal WHERE seq IN (SELECT MAX(seq) FROM journal"
                        " WHERE check_name <> '' AND event <> 'command_refused'"
                        " GROUP BY asset, check_name) ORDER BY asset, check_name");
  if (!select) return select.error();
  return journal_rows(select.value());
}

Result<std::optional<std::string>> StateStore::meta(const std::string& key) const {
  auto select = SqliteStatement::prepare(*connection_, "SELECT value FROM meta WHERE key = ?1");
  if (!select) return select.error();
  select->bind_text(1, key);
  auto row = select->step();
  if (!row) return row.error();
  if (!row.value()) return std::optional<std::string>();
  return std::optional<std::string>(select->column_text(0));
}

}  // namespace bw::io
