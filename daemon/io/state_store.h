// The durable state of the daemon: one SQLite file, <state dir>/brinewatch-state.sqlite, holding
// the transition journal, the saved state of every alert, checkpoints of run-time state, and a
// few metadata keys. The layout is documented in io/state_schema.h.
//
// The store knows nothing of the engine's types: alert states and checkpoints are opaque bytes
// (the engine encodes them with engine/state_codec.h), journal entries are plain rows.
//
// Durability: the file is in WAL mode with synchronous=FULL, so a commit() that returned success
// survives a crash of the process or a loss of power; a commit that did not return may land
// whole or not at all, never in part. Every commit() is one transaction.
//
// Opening, and what happens to a file that cannot be used:
//  - No file: a new one is made (report.created).
//  - A file that is not a database, is malformed (SQLite reports corruption or PRAGMA
//    quick_check finds problems), or holds tables that are not ours (version 0 with tables, or
//    tables or columns missing for its version): the file is never deleted or overwritten. It is
//    renamed, with its -wal and -shm files, to brinewatch-state.sqlite.damaged-YYYYMMDDTHHMMSSZ
//    (-wal, -shm appended; "-2", "-3"... added if that name is taken), a fresh store is made,
//    and the report says where the old file went and why (report.moved_aside, report.problem).
//    The daemon is expected to raise its own alert when moved_aside is set.
//  - A write-ahead log (-wal) that does not begin with SQLite's WAL header: SQLite would drop it
//    without a word. It is renamed (with the -shm) to brinewatch-state.sqlite.damaged-<time>-wal
//    and the database is kept with what it held at its last checkpoint; report.moved_aside names
//    the log, report.created stays false (unless the database then proves damaged too).
//  - A -wal or -shm left without its database: moved aside the same way before a new store is
//    made, so a stale log is never replayed into it.
//  - A schema version newer than this program knows: open() fails and leaves the file alone; the
//    operator should upgrade brinewatch (or move the file away to start fresh).
//  - Anything else (permission denied, locked by another process, disk full, a symbolic link in
//    place of the file): open() fails and leaves the file alone; such a problem is not evidence
//    of damage.
// An older version is migrated forward (report.migrated_from).
//
// Thread safety: a StateStore is used from one thread at a time. Several processes may read the
// file at once (WAL), e.g. an offline dump while the daemon runs.
#pragma once

#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/result.h"

namespace bw::io {

class SqliteConnection;

// One row of the transition journal. Text fields are '' when they do not apply; event is never
// empty.
struct JournalEntry {
  std::int64_t seq = 0;      // assigned by the store on commit; ignored on input
  std::int64_t time_us = 0;  // event time, microseconds since 1970-01-01 UTC
  std::string site, asset, check, event, from_state, to_state, priority, cause, who, reason, source,
      tag, message;
  std::optional<double> value;  // a NaN is read back as no value (SQLite stores NaN as NULL)

  bool operator==(const JournalEntry&) const = default;
};

// The saved lifecycle state of one alert; (asset, check) is the key, check is not empty.
struct AlertRecord {
  std::string asset, check;
  std::string state;  // opaque bytes

  bool operator==(const AlertRecord&) const = default;
};

// The saved run-time state of one scope: an asset name, or "alert_book", "notification_policy"...
struct Checkpoint {
  std::string scope;            // not empty
  std::string definition_hash;  // of the definition the state was computed under
  std::int64_t taken_at_us = 0;
  std::string state;  // opaque bytes

  bool operator==(const Checkpoint&) const = default;
};

// A message waiting in the outbox; id is assigned by the store (ignored on input).
struct OutboxMessage {
  std::int64_t id = 0;
  std::string topic;
  std::string payload;
  int qos = 1;
  bool retained = false;
  std::int64_t created_us = 0;

  bool operator==(const OutboxMessage&) const = default;
};

struct StoreOpenReport {
  bool created = false;  // the store holds nothing from before (new, empty or replaced file)
  std::optional<std::filesystem::path> moved_aside;  // where a damaged file was moved to
  std::string problem;     // why it was moved aside, for a person; empty otherwise
  int schema_version = 0;  // after opening: always the current version
  int migrated_from = 0;   // the file's version before opening (0 for a new store)
};

class StateStore {
 public:
  static constexpr const char* kFileName = "brinewatch-state.sqlite";

  // Everything one commit() writes, atomically.
  struct Batch {
    std::vector<JournalEntry> journal;    // appended in order, seq assigned
    std::vector<AlertRecord> alerts;      // inserted or replaced by (asset, check)
    std::vector<Checkpoint> checkpoints;  // inserted or replaced by scope
    std::vector<std::pair<std::string, std::string>> meta;  // key -> value, replaced
    std::vector<OutboxMessage> outbox;       // appended in order, id assigned
    std::vector<std::int64_t> delivered;     // outbox ids to delete (the broker has them)

    bool empty() const {
      return journal.empty() && alerts.empty() && checkpoints.empty() && meta.empty() &&
             outbox.empty() && delivered.empty();
    }
  };

  // Opens or creates <dir>/brinewatch-state.sqlite; creates dir (mode 0700) when missing. See
  // the top of this file for damaged files. `report` is filled in on success and on failure.
  static Result<std::unique_ptr<StateStore>> open(const std::filesystem::path& dir,
                                                  StoreOpenReport& report);

  ~StateStore();
  StateStore(const StateStore&) = delete;
  StateStore& operator=(const StateStore&) = delete;

  // Writes the whole batch in one transaction and returns the seq of the last journal entry in
  // the store afterwards (the previous last when the batch has no journal entries; 0 when the
  // journal is empty). On failure nothing of the batch is stored.
  Result<std::int64_t> commit(const Batch& batch);

  // Ordered by (asset, check).
  Result<std::vector<AlertRecord>> load_alerts() const;
  // Ordered by scope.
  Result<std::vector<Checkpoint>> load_checkpoints() const;
  // At most `limit` entries with seq > after_seq, in seq order.
  Result<std::vector<JournalEntry>> read_journal(std::int64_t after_seq, std::size_t limit) const;
  // The newest journal entry of each alert (asset, check), refused commands left out, ordered by
  // (asset, check): the priority and state each alert was last journaled with.
  Result<std::vector<JournalEntry>> latest_per_alert() const;
  Result<std::optional<std::string>> meta(const std::string& key) const;
  // At most `limit` outbox messages with id > after_id, oldest first.
  Result<std::vector<OutboxMessage>> read_outbox(std::int64_t after_id, std::size_t limit) const;
  // The seq of the newest journal entry, 0 when there is none.
  Result<std::int64_t> last_seq() const;

  const std::filesystem::path& path() const;

 private:
  explicit StateStore(std::unique_ptr<SqliteConnection> connection);

  std::unique_ptr<SqliteConnection> connection_;
};

}  // namespace bw::io
