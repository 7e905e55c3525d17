// The on-disk layout of the state store, brinewatch-state.sqlite: a public interface. A later
// brinewatch, an offline dump tool and a person at the sqlite3 shell all read it, so columns and
// tables are never renumbered, renamed or dropped; a change is a new migration appended to
// kMigrations.
//
// The file's version is SQLite's PRAGMA user_version: 0 for an empty file, N after
// kMigrations[0..N-1] have been applied. Each migration runs in its own transaction together
// with the user_version bump, so a file is always at exactly one version.
//
// Tables (version 3):
//   journal      One row per alert transition or command, in the order they happened.
//                seq          INTEGER PRIMARY KEY  assigned by the store: 1, 2, 3... no gaps
//                time_us      INTEGER  event time, microseconds since 1970-01-01 UTC
//                site, asset, check_name, event, from_state, to_state, priority, cause, who,
//                reason, source, tag, message   TEXT, '' when not applicable; event not ''
//                value        REAL     the sample value behind the transition, or NULL
//   alert_state  The saved lifecycle state of one alert, as bytes the engine encodes.
//                asset TEXT, check_name TEXT (not ''), state BLOB; PRIMARY KEY (asset, check_name)
//   checkpoint   The saved run-time state of one scope (an asset name, "alert_book", ...).
//                scope TEXT PRIMARY KEY (not ''), definition_hash TEXT (the hash of the
//                definition the state was computed under), taken_at_us INTEGER, state BLOB
//   meta         Small named settings of the store itself (since version 2).
//                key TEXT PRIMARY KEY (not ''), value TEXT
//   index journal_by_alert on journal(asset, check_name, seq) (since version 2)
//   outbox       Messages to publish, written in the same transaction as the journal entries
//                they come from and deleted only once the broker acknowledged them (since 3).
//                id INTEGER PRIMARY KEY AUTOINCREMENT (publish order; never reused), topic TEXT
//                (not ''), payload BLOB, qos INTEGER (0 or 1), retained INTEGER (0/1),
//                created_us INTEGER
//
// The column is called check_name because CHECK is an SQL keyword. Needs SQLite 3.24 or later
// (INSERT ... ON CONFLICT DO UPDATE).
#pragma once

#include <array>
#include <string_view>

namespace bw::io::state_schema {

// kMigrations[i] takes a file from version i to version i + 1.
inline constexpr std::array<std::string_view, 3> kMigrations = {
    // 0 -> 1: the journal, alert states and checkpoints.
    R"sql(
CREATE TABLE journal (
  seq INTEGER PRIMARY KEY,
  time_us INTEGER NOT NULL,
  site TEXT NOT NULL,
  asset TEXT NOT NULL,
  check_name TEXT NOT NULL,
  event TEXT NOT NULL CONSTRAINT journal_event_not_empty CHECK (event <> ''),
  from_state TEXT NOT NULL,
  to_state TEXT NOT NULL,
  priority TEXT NOT NULL,
  cause TEXT NOT NULL,
  who TEXT NOT NULL,
  reason TEXT NOT NULL,
  source TEXT NOT NULL,
  tag TEXT NOT NULL,
  message TEXT NOT NULL,
  value REAL
);
CREATE TABLE alert_state (
  asset TEXT NOT NULL,
  check_name TEXT NOT NULL CONSTRAINT alert_check_not_empty CHECK (check_name <> ''),
  state BLOB NOT NULL,
  PRIMARY KEY (asset, check_name)
);
CREATE TABLE checkpoint (
  scope TEXT PRIMARY KEY NOT NULL CONSTRAINT checkpoint_scope_not_empty CHECK (scope <> ''),
  definition_hash TEXT NOT NULL,
  taken_at_us INTEGER NOT NULL,
  state BLOB NOT NULL
);
)sql",
    // 1 -> 2: store metadata, and reading one alert's history without scanning the journal.
    R"sql(
CREATE TABLE meta (
  key TEXT PRIMARY KEY NOT NULL CONSTRAINT meta_key_not_empty CHECK (key <> ''),
  value TEXT NOT NULL
);
CREATE INDEX journal_by_alert ON journal (asset, check_name, seq);
)sql",
    // 2 -> 3: messages waiting to be published, in order; deleted once the broker has them.
    R"sql(
CREATE TABLE outbox (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  topic TEXT NOT NULL CONSTRAINT outbox_topic_not_empty CHECK (topic <> ''),
  payload BLOB NOT NULL,
  qos INTEGER NOT NULL CONSTRAINT outbox_qos_0_or_1 CHECK (qos IN (0, 1)),
  retained INTEGER NOT NULL,
  created_us INTEGER NOT NULL
);
)sql",
};

// The version this program writes and the newest it can read.
inline constexpr int kCurrentVersion = static_cast<int>(kMigrations.size());

}  // namespace bw::io::state_schema
