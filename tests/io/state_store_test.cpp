// The state store: round trips, atomic batches, migrations, and what happens to damaged files.
//
// Damaged files are made here from a good store (no binary fixtures). Every file is inspected
// with a plain SQLite connection (state_store_testing.h), i.e. with SQLite's own checks rather
// than the store's.
#include "io/state_store.h"

#include <gtest/gtest.h>
#include <sys/stat.h>

#include <chrono>
#include <cmath>
#include <ctime>
#include <filesystem>
#include <limits>
#include <ostream>
#include <regex>
#include <string>
#include <vector>

#include "io/state_schema.h"
#include "state_store_testing.h"

namespace bw::io {
namespace {

namespace fs = std::filesystem;
using testing::names_containing;
using testing::RawDatabase;
using testing::read_bytes;
using testing::ScratchDir;
using testing::write_bytes;

std::unique_ptr<StateStore> open_ok(const fs::path& dir, StoreOpenReport& report) {
  auto store = StateStore::open(dir, report);
  if (!store) {
    ADD_FAILURE() << store.error().message;
    return nullptr;
  }
  return std::move(store.value());
}

std::unique_ptr<StateStore> open_ok(const fs::path& dir) {
  StoreOpenReport report;
  return open_ok(dir, report);
}

JournalEntry entry(std::string event, std::int64_t time_us, std::optional<double> value) {
  JournalEntry e;
  e.time_us = time_us;
  e.site = "Dry Creek SWD 4";
  e.asset = "injection_pump_2";
  e.check = "motor_current_high";
  e.event = std::move(event);
  e.from_state = "normal";
  e.to_state = "unacknowledged";
  e.priority = "high";
  e.cause = "sample DC4.IT201 at 2026-03-01T06:00:00Z";
  e.who = "lease operator";
  e.reason = "checked on site, ok";
  e.source = "engine";
  e.tag = "DC4.IT201";
  e.message = "pump 2 motor current 6 % above its baseline";
  e.value = value;
  return e;
}

// Bytes 0..255 repeated, so that zero bytes and every other value are in the blob.
std::string every_byte(std::size_t size) {
  std::string bytes(size, '\0');
  for (std::size_t i = 0; i < size; ++i) bytes[i] = static_cast<char>(i % 256);
  return bytes;
}

std::vector<JournalEntry> whole_journal(const StateStore& store) {
  auto journal = store.read_journal(0, std::numeric_limits<std::size_t>::max());
  EXPECT_TRUE(journal.ok()) << journal.error().message;
  return journal.ok() ? journal.value() : std::vector<JournalEntry>{};
}

// A store with one record of every kind, closed again.
void make_good_store(const fs::path& dir) {
  auto store = open_ok(dir);
  ASSERT_NE(store, nullptr);
  StateStore::Batch batch;
  batch.journal = {entry("raised", 1, 24.5), entry("acknowledged", 2, std::nullopt)};
  batch.alerts = {{"injection_pump_2", "motor_current_high", every_byte(300)}};
  batch.checkpoints = {{"injection_pump_2", "hash-1", 3, every_byte(200'000)}};
  batch.meta = {{"written_by", "state_store_test"}};
  ASSERT_TRUE(store->commit(batch).ok());
}

TEST(StateStore, NewStoreIsCreatedInAMissingDirectoryWithMode0700) {
  ScratchDir scratch;
  const fs::path dir = scratch.path() / "var" / "lib" / "brinewatch";
  StoreOpenReport report;
  auto store = open_ok(dir, report);
  ASSERT_NE(store, nullptr);
  EXPECT_TRUE(report.created);
  EXPECT_FALSE(report.moved_aside);
  EXPECT_EQ(report.schema_version, state_schema::kCurrentVersion);
  EXPECT_EQ(report.migrated_from, 0);
  EXPECT_EQ(store->path(), dir / "brinewatch-state.sqlite");
  struct stat info {};
  ASSERT_EQ(::stat(dir.c_str(), &info), 0);
  EXPECT_EQ(info.st_mode & 0777, 0700u);
  EXPECT_EQ(store->last_seq().value(), 0);
  // The 16-byte header string of every SQLite 3 database (SQLite file format; from memory).
  EXPECT_EQ(read_bytes(store->path()).substr(0, 16), std::string("SQLite format 3\0", 16));
  RawDatabase raw(store->path());
  EXPECT_EQ(raw.text("PRAGMA journal_mode"), "wal");
  EXPECT_EQ(raw.text("PRAGMA user_version"), std::to_string(state_schema::kCurrentVersion));
}

TEST(StateStore, EveryRecordKindRoundTripsThroughAReopen) {
  ScratchDir scratch;
  StateStore::Batch batch;
  batch.journal = {entry("raised", 1'772'344'800'000'000, 24.5),
                   entry("acknowledged", 1'772'344'900'000'000, std::nullopt),
                   entry("cleared", -5, -std::numeric_limits<double>::infinity()),
                   entry("shelved", 0, 0.0)};
  constexpr char kAwkwardText[] =
      "text with a zero \0 byte and UTF-8 \xc2\xb0"
      "C";
  batch.journal[1].message = std::string(kAwkwardText, sizeof kAwkwardText - 1);
  batch.alerts = {{"filter_1", "dp_high", ""},
                  {"filter_1", "dp_high_high", std::string("\0\0\0", 3)},
                  {"tank_3", "level_high", every_byte(1 << 20)}};
  batch.checkpoints = {
      {"alert_book", "", 0, ""},
      {"injection_pump_2", "5d41402abc4b2a76", 1'772'344'800'000'000, every_byte((1 << 20) + 7)}};
  batch.meta = {{"schema_note", "round trip"}, {"empty", ""}};
  {
    auto store = open_ok(scratch.path());
    ASSERT_NE(store, nullptr);
    auto last = store->commit(batch);
    ASSERT_TRUE(last.ok()) << last.error().message;
    EXPECT_EQ(last.value(), 4);
  }
  StoreOpenReport report;
  auto store = open_ok(scratch.path(), report);
  ASSERT_NE(store, nullptr);
  EXPECT_FALSE(report.created);
  EXPECT_EQ(report.migrated_from, state_schema::kCurrentVersion);

  const auto journal = whole_journal(*store);
  ASSERT_EQ(journal.size(), batch.journal.size());
  for (std::size_t i = 0; i < journal.size(); ++i) {
    JournalEntry want = batch.journal[i];
    want.seq = static_cast<std::int64_t>(i) + 1;
    EXPECT_EQ(journal[i], want) << "entry " << i;
  }
  EXPECT_EQ(store->load_alerts().value(), batch.alerts);  // already in (asset, check) order
  EXPECT_EQ(store->load_checkpoints().value(), batch.checkpoints);
  EXPECT_EQ(store->meta("schema_note").value(), std::optional<std::string>("round trip"));
  EXPECT_EQ(store->meta("empty").value(), std::optional<std::string>(""));
  EXPECT_EQ(store->meta("never_set").value(), std::nullopt);
}

TEST(StateStore, NanValueIsReadBackAsNoValue) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  ASSERT_TRUE(store->commit({{entry("raised", 1, std::nan(""))}, {}, {}, {}}).ok());
  EXPECT_EQ(whole_journal(*store).at(0).value, std::nullopt);
}

TEST(StateStore, AlertsCheckpointsAndMetaAreReplacedByTheirKeys) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  ASSERT_TRUE(
      store->commit({{}, {{"a", "c", "1"}, {"b", "c", "2"}}, {{"s", "h1", 1, "x"}}, {{"k", "v1"}}})
          .ok());
  ASSERT_TRUE(store->commit({{}, {{"a", "c", "3"}}, {{"s", "h2", 2, "y"}}, {{"k", "v2"}}}).ok());
  EXPECT_EQ(store->load_alerts().value(),
            (std::vector<AlertRecord>{{"a", "c", "3"}, {"b", "c", "2"}}));
  EXPECT_EQ(store->load_checkpoints().value(), (std::vector<Checkpoint>{{"s", "h2", 2, "y"}}));
  EXPECT_EQ(store->meta("k").value(), std::optional<std::string>("v2"));
}

TEST(StateStore, JournalSeqIsContiguousAcrossReopens) {
  ScratchDir scratch;
  for (int run = 0; run < 3; ++run) {
    auto store = open_ok(scratch.path());
    ASSERT_NE(store, nullptr);
    for (int batch = 0; batch < 4; ++batch) {
      StateStore::Batch b;
      for (int i = 0; i <= batch; ++i) b.journal.push_back(entry("raised", run, batch));
      ASSERT_TRUE(store->commit(b).ok());
    }
  }
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  const auto journal = whole_journal(*store);
  ASSERT_EQ(journal.size(), 3u * (1 + 2 + 3 + 4));
  for (std::size_t i = 0; i < journal.size(); ++i) EXPECT_EQ(journal[i].seq, std::int64_t(i) + 1);
  EXPECT_EQ(store->last_seq().value(), 30);
}

// The outbox keeps messages in publish order until the broker has them; ids are never reused,
// so a consumer can tell a re-sent message from a new one.
TEST(StateStore, OutboxKeepsOrderAcrossReopensAndNeverReusesIds) {
  ScratchDir scratch;
  {
    auto store = open_ok(scratch.path());
    ASSERT_NE(store, nullptr);
    StateStore::Batch b;
    for (int i = 0; i < 3; ++i) {
      b.outbox.push_back({.topic = "site/alerts", .payload = "m" + std::to_string(i), .qos = 1,
                          .retained = i == 2, .created_us = 100 + i});
    }
    ASSERT_TRUE(store->commit(b).ok());
  }
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  auto waiting = store->read_outbox(0, 100);
  ASSERT_TRUE(waiting.ok());
  ASSERT_EQ(waiting->size(), 3u);
  EXPECT_EQ(waiting.value()[0].payload, "m0");
  EXPECT_EQ(waiting.value()[2].payload, "m2");
  EXPECT_TRUE(waiting.value()[2].retained);
  EXPECT_LT(waiting.value()[0].id, waiting.value()[1].id);

  StateStore::Batch delivered;
  delivered.delivered = {waiting.value()[0].id, waiting.value()[1].id, waiting.value()[2].id};
  delivered.outbox.push_back({.topic = "site/alerts", .payload = "m3", .qos = 1, .created_us = 200});
  ASSERT_TRUE(store->commit(delivered).ok());
  auto after = store->read_outbox(0, 100);
  ASSERT_TRUE(after.ok());
  ASSERT_EQ(after->size(), 1u);
  EXPECT_EQ(after.value()[0].payload, "m3");
  EXPECT_GT(after.value()[0].id, waiting.value()[2].id);
  EXPECT_TRUE(store->read_outbox(after.value()[0].id, 100)->empty());
}

TEST(StateStore, CommitWithoutJournalReturnsThePreviousLastSeq) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  EXPECT_EQ(store->commit({{}, {{"a", "c", "1"}}, {}, {}}).value(), 0);
  EXPECT_EQ(
      store->commit({{entry("raised", 1, 1.0), entry("cleared", 2, 0.5)}, {}, {}, {}}).value(), 2);
  EXPECT_EQ(store->commit({{}, {}, {}, {{"k", "v"}}}).value(), 2);
}

TEST(StateStore, JournalIsReadInPagesAfterAGivenSeq) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  StateStore::Batch batch;
  for (int i = 0; i < 10; ++i) batch.journal.push_back(entry("raised", i, i));
  ASSERT_TRUE(store->commit(batch).ok());
  const auto page = store->read_journal(3, 4).value();
  ASSERT_EQ(page.size(), 4u);
  EXPECT_EQ(page.front().seq, 4);
  EXPECT_EQ(page.back().seq, 7);
  EXPECT_EQ(page.front().time_us, 3);
  EXPECT_EQ(store->read_journal(8, 100).value().size(), 2u);
  EXPECT_TRUE(store->read_journal(10, 100).value().empty());
  EXPECT_TRUE(store->read_journal(0, 0).value().empty());
}

TEST(StateStore, TheLatestEntryOfEachAlertLeavesRefusedCommandsOut) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  StateStore::Batch batch;
  batch.journal = {entry("raised", 1, 1.0), entry("acknowledged", 2, std::nullopt),
                   entry("command_refused", 3, std::nullopt)};
  JournalEntry other = entry("raised", 4, 2.0);
  other.asset = "disposal_well";
  other.check = "injectivity_low";
  other.priority = "urgent";
  batch.journal.push_back(other);
  JournalEntry asset_wide = entry("command_refused", 5, std::nullopt);
  asset_wide.check = "";
  batch.journal.push_back(asset_wide);
  ASSERT_TRUE(store->commit(batch).ok());
  const auto latest = store->latest_per_alert();
  ASSERT_TRUE(latest.ok()) << latest.error().message;
  ASSERT_EQ(latest.value().size(), 2u);
  EXPECT_EQ(latest.value()[0].asset, "disposal_well");
  EXPECT_EQ(latest.value()[0].priority, "urgent");
  EXPECT_EQ(latest.value()[1].asset, "injection_pump_2");
  EXPECT_EQ(latest.value()[1].seq, 2) << "the refused command at seq 3 is not the alert's state";
  EXPECT_EQ(latest.value()[1].event, "acknowledged");
}

TEST(StateStore, BatchThatFailsMidwayLeavesNothingBehind) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  ASSERT_TRUE(store->commit({{entry("raised", 1, 1.0)}, {{"a", "c", "before"}}, {}, {}}).ok());
  // The journal rows and the alert update go in first; the checkpoint without a scope is refused
  // by the table's constraint after them.
  StateStore::Batch bad;
  bad.journal = {entry("cleared", 2, 0.0), entry("acknowledged", 3, std::nullopt)};
  bad.alerts = {{"a", "c", "after"}, {"b", "c", "new"}};
  bad.checkpoints = {{"pump", "h", 1, "ok"}, {"", "h", 1, "no scope"}};
  bad.meta = {{"k", "v"}};
  const auto result = store->commit(bad);
  ASSERT_FALSE(result.ok());
  EXPECT_NE(result.error().message.find("checkpoint_scope_not_empty"), std::string::npos)
      << result.error().message;
  EXPECT_NE(result.error().message.find(store->path().string()), std::string::npos);

  EXPECT_EQ(store->last_seq().value(), 1);
  EXPECT_EQ(store->load_alerts().value(), (std::vector<AlertRecord>{{"a", "c", "before"}}));
  EXPECT_TRUE(store->load_checkpoints().value().empty());
  EXPECT_EQ(store->meta("k").value(), std::nullopt);
  // The store stays usable and the journal has no gap where the refused batch was.
  EXPECT_EQ(store->commit({{entry("cleared", 4, 0.0)}, {}, {}, {}}).value(), 2);
}

TEST(StateStore, JournalEntryWithoutAnEventIsRefused) {
  ScratchDir scratch;
  auto store = open_ok(scratch.path());
  ASSERT_NE(store, nullptr);
  const auto result = store->commit({{entry("raised", 1, 1.0), entry("", 2, 2.0)}, {}, {}, {}});
  ASSERT_FALSE(result.ok());
  EXPECT_NE(result.error().message.find("journal_event_not_empty"), std::string::npos);
  EXPECT_EQ(store->last_seq().value(), 0);
}

// ---- Damaged files --------------------------------------------------------------------------

struct Damage {
  const char* name;
  void (*apply)(const fs::path& database);
  const char* problem_contains;  // a word the report's problem must contain
};

void truncate_to_half(const fs::path& database) {
  fs::resize_file(database, fs::file_size(database) / 2);
}

void overwrite_first_100_bytes(const fs::path& database) {
  std::string bytes = read_bytes(database);
  for (std::size_t i = 0; i < 100; ++i) bytes[i] = static_cast<char>(0xA5 ^ (i * 7));
  write_bytes(database, bytes);
}

void replace_with_text(const fs::path& database) {
  fs::remove(database);
  write_bytes(database, "Dry Creek SWD 4 tank levels, written by hand\nT1,12.5 ft\nT2,9.1 ft\n");
}

void replace_with_foreign_database(const fs::path& database) {
  fs::remove(database);
  RawDatabase raw(database);
  raw.exec(
      "CREATE TABLE truck_tickets (ticket TEXT, barrels REAL); "
      "INSERT INTO truck_tickets VALUES ('T-0001', 120.0)");
}

void drop_a_table_keeping_the_version(const fs::path& database) {
  RawDatabase raw(database);
  raw.exec("DROP TABLE alert_state");
}

void rename_a_column(const fs::path& database) {
  RawDatabase raw(database);
  raw.exec("ALTER TABLE checkpoint RENAME COLUMN definition_hash TO config_hash");
}

void PrintTo(const Damage& damage, std::ostream* out) { *out << damage.name; }

class DamagedStore : public ::testing::TestWithParam<Damage> {};

TEST_P(DamagedStore, IsMovedAsideUnchangedAndAFreshStoreIsMade) {
  ScratchDir scratch;
  make_good_store(scratch.path());
  const fs::path database = scratch.path() / StateStore::kFileName;
  GetParam().apply(database);
  const std::string damaged_bytes = read_bytes(database);

  const auto before = std::chrono::system_clock::now();
  StoreOpenReport report;
  auto store = open_ok(scratch.path(), report);
  ASSERT_NE(store, nullptr);
  EXPECT_TRUE(report.created);
  EXPECT_EQ(report.migrated_from, 0);
  EXPECT_NE(report.problem.find(GetParam().problem_contains), std::string::npos) << report.problem;
  ASSERT_TRUE(report.moved_aside);
  const std::string moved_name = report.moved_aside->filename().string();
  std::smatch stamp;
  ASSERT_TRUE(std::regex_match(moved_name, stamp,
                               std::regex(R"(brinewatch-state\.sqlite\.damaged-(\d{8}T\d{6}Z))")))
      << moved_name;
  // The stamp is the UTC time of the move, to the second.
  const std::time_t now = std::chrono::system_clock::to_time_t(before);
  std::tm utc{};
  gmtime_r(&now, &utc);
  char expected[20];
  std::strftime(expected, sizeof expected, "%Y%m%dT%H%M%S", &utc);
  EXPECT_LE(std::string(expected) + "Z", stamp[1].str());

  EXPECT_EQ(read_bytes(*report.moved_aside), damaged_bytes) << "the evidence was changed";
  EXPECT_EQ(names_containing(scratch.path(), ".damaged-").front(), moved_name);
  EXPECT_EQ(store->last_seq().value(), 0);
  EXPECT_TRUE(store->load_alerts().value().empty());
  EXPECT_EQ(store->commit({{entry("raised", 1, 1.0)}, {}, {}, {}}).value(), 1);
  RawDatabase raw(store->path());
  EXPECT_EQ(raw.text("PRAGMA integrity_check"), "ok");
}

INSTANTIATE_TEST_SUITE_P(
    Files, DamagedStore,
    ::testing::Values(
        Damage{"truncated_to_half", truncate_to_half, "malformed"},
        Damage{"first_100_bytes_garbage", overwrite_first_100_bytes, "not a database"},
        Damage{"text_file_named_like_the_database", replace_with_text, "not a database"},
        Damage{"foreign_tables_without_version", replace_with_foreign_database, "truck_tickets"},
        Damage{"table_missing_for_its_version", drop_a_table_keeping_the_version, "alert_state"},
        Damage{"column_renamed", rename_a_column, "checkpoint"}),
    [](const auto& param_info) { return std::string(param_info.param.name); });

TEST(StateStore, TwoDamagedFilesInOneSecondGetDistinctNames) {
  ScratchDir scratch;
  const fs::path database = scratch.path() / StateStore::kFileName;
  std::vector<std::string> moved;
  for (int i = 0; i < 2; ++i) {
    write_bytes(database, "not a database, take " + std::to_string(i));
    StoreOpenReport report;
    ASSERT_NE(open_ok(scratch.path(), report), nullptr);
    ASSERT_TRUE(report.moved_aside);
    moved.push_back(read_bytes(*report.moved_aside));
  }
  EXPECT_EQ(moved, (std::vector<std::string>{"not a database, take 0", "not a database, take 1"}));
  EXPECT_EQ(names_containing(scratch.path(), ".damaged-").size(), 2u);
}

TEST(StateStore, JunkWriteAheadLogIsMovedAsideAndTheDatabaseKept) {
  ScratchDir scratch;
  make_good_store(scratch.path());
  const fs::path wal = scratch.path() / "brinewatch-state.sqlite-wal";
  const std::string junk(5000, 'J');
  write_bytes(wal, junk);

  StoreOpenReport report;
  auto store = open_ok(scratch.path(), report);
  ASSERT_NE(store, nullptr);
  EXPECT_FALSE(report.created);
  ASSERT_TRUE(report.moved_aside);
  EXPECT_TRUE(std::regex_match(report.moved_aside->filename().string(),
                               std::regex(R"(brinewatch-state\.sqlite\.damaged-\d{8}T\d{6}Z-wal)")))
      << *report.moved_aside;
  EXPECT_EQ(read_bytes(*report.moved_aside), junk);
  EXPECT_NE(report.problem.find("write-ahead log"), std::string::npos) << report.problem;
  EXPECT_EQ(store->last_seq().value(), 2);
  EXPECT_EQ(store->load_checkpoints().value().size(), 1u);
}

TEST(StateStore, WriteAheadLogWithoutItsDatabaseIsMovedAsideBeforeANewStoreIsMade) {
  ScratchDir scratch;
  make_good_store(scratch.path());
  // Keep a real log of the good store, then lose the database.
  {
    RawDatabase raw(scratch.path() / StateStore::kFileName);
    raw.exec("PRAGMA wal_autocheckpoint = 0; INSERT INTO meta VALUES ('in_the_log', 'yes')");
    fs::copy_file(scratch.path() / "brinewatch-state.sqlite-wal", scratch.path() / "kept-wal");
  }
  fs::remove(scratch.path() / StateStore::kFileName);
  fs::rename(scratch.path() / "kept-wal", scratch.path() / "brinewatch-state.sqlite-wal");

  StoreOpenReport report;
  auto store = open_ok(scratch.path(), report);
  ASSERT_NE(store, nullptr);
  EXPECT_TRUE(report.created);
  ASSERT_TRUE(report.moved_aside);
  EXPECT_NE(report.problem.find("without its database"), std::string::npos);
  EXPECT_EQ(store->meta("in_the_log").value(), std::nullopt);
  RawDatabase raw(store->path());
  EXPECT_EQ(raw.text("PRAGMA integrity_check"), "ok");
}

TEST(StateStore, EmptyFileIsTakenAsANewStore) {
  ScratchDir scratch;
  write_bytes(scratch.path() / StateStore::kFileName, "");
  StoreOpenReport report;
  auto store = open_ok(scratch.path(), report);
  ASSERT_NE(store, nullptr);
  EXPECT_TRUE(report.created);
  EXPECT_FALSE(report.moved_aside);
  EXPECT_EQ(store->commit({{entry("raised", 1, 1.0)}, {}, {}, {}}).value(), 1);
}

TEST(StateStore, NewerSchemaVersionIsRefusedAndTheFileLeftInPlace) {
  ScratchDir scratch;
  make_good_store(scratch.path());
  const fs::path database = scratch.path() / StateStore::kFileName;
  {
    RawDatabase raw(database);
    raw.exec("PRAGMA user_version = " + std::to_string(state_schema::kCurrentVersion + 1));
  }
  const std::string bytes = read_bytes(database);
  StoreOpenReport report;
  const auto store = StateStore::open(scratch.path(), report);
  ASSERT_FALSE(store.ok());
  EXPECT_NE(store.error().message.find("newer brinewatch"), std::string::npos)
      << store.error().message;
  EXPECT_NE(store.error().message.find("Upgrade"), std::string::npos);
  EXPECT_FALSE(report.moved_aside);
  EXPECT_EQ(read_bytes(database), bytes);
  EXPECT_TRUE(names_containing(scratch.path(), ".damaged-").empty());
}

TEST(StateStore, DirectoryInPlaceOfTheDatabaseIsAnErrorNotDamage) {
  ScratchDir scratch;
  fs::create_directory(scratch.path() / StateStore::kFileName);
  StoreOpenReport report;
  const auto store = StateStore::open(scratch.path(), report);
  ASSERT_FALSE(store.ok());
  EXPECT_NE(store.error().message.find(StateStore::kFileName), std::string::npos);
  EXPECT_FALSE(report.moved_aside);
  EXPECT_TRUE(fs::is_directory(scratch.path() / StateStore::kFileName));
}

// ---- Migrations ---------------------------------------------------------------------------

void expect_migrated_from_1_with_data(const fs::path& dir, const JournalEntry& first_entry) {
  StoreOpenReport report;
  auto store = open_ok(dir, report);
  ASSERT_NE(store, nullptr);
  EXPECT_FALSE(report.created);
  EXPECT_FALSE(report.moved_aside);
  EXPECT_EQ(report.migrated_from, 1);
  EXPECT_EQ(report.schema_version, state_schema::kCurrentVersion);
  const auto journal = whole_journal(*store);
  ASSERT_EQ(journal.size(), 2u);
  EXPECT_EQ(journal[0], first_entry);
  EXPECT_EQ(journal[1].event, "acknowledged");
  EXPECT_EQ(journal[1].value, std::nullopt);
  EXPECT_EQ(store->load_alerts().value(),
            (std::vector<AlertRecord>{{"filter_1", "dp_high", std::string("\1\2\0\3\4", 5)}}));
  const auto checkpoints = store->load_checkpoints().value();
  ASSERT_EQ(checkpoints.size(), 1u);
  EXPECT_EQ(checkpoints[0].definition_hash, "3f9a0c12");
  // What versions 2 and 3 added works, and the journal continues where version 1 left it.
  StateStore::Batch batch{{first_entry}, {}, {}, {{"migrated", "yes"}}};
  batch.outbox.push_back({.topic = "filter_1/alerts", .payload = "{}", .qos = 1});
  EXPECT_EQ(store->commit(batch).value(), 3);
  EXPECT_EQ(store->meta("migrated").value(), std::optional<std::string>("yes"));
  EXPECT_EQ(store->read_outbox(0, 10).value().size(), 1u);
  RawDatabase raw(store->path());
  EXPECT_EQ(raw.text("PRAGMA user_version"), std::to_string(state_schema::kCurrentVersion));
  EXPECT_EQ(raw.text("SELECT name FROM sqlite_master WHERE type = 'index' AND sql IS NOT NULL"),
            "journal_by_alert");
  EXPECT_EQ(raw.text("PRAGMA integrity_check"), "ok");
}

JournalEntry version1_first_entry() {
  JournalEntry e;
  e.seq = 1;
  e.time_us = 1'772'344'800'000'000;
  e.site = "Dry Creek SWD 4";
  e.asset = "filter_1";
  e.check = "dp_high";
  e.event = "raised";
  e.from_state = "normal";
  e.to_state = "unacknowledged";
  e.priority = "high";
  e.cause = "sample DC4.PDT101 at 2026-03-01T06:00:00Z";
  e.source = "engine";
  e.tag = "DC4.PDT101";
  e.message = "filter 1 differential pressure high";
  e.value = 24.5;
  return e;
}

TEST(StateStoreMigration, FrozenVersion1FileMigratesKeepingItsData) {
  ScratchDir scratch;
  {
    RawDatabase raw(scratch.path() / StateStore::kFileName);
    raw.exec(read_bytes(fs::path(BRINEWATCH_SOURCE_DIR) / "tests/io/fixtures/state/version1.sql"));
    ASSERT_EQ(raw.text("PRAGMA user_version"), "1");
  }
  expect_migrated_from_1_with_data(scratch.path(), version1_first_entry());
}

TEST(StateStoreMigration, FileBuiltWithTheFirstMigrationOnlyMigratesKeepingItsData) {
  ScratchDir scratch;
  {
    RawDatabase raw(scratch.path() / StateStore::kFileName);
    raw.exec("PRAGMA journal_mode = WAL");
    raw.exec(std::string(state_schema::kMigrations[0]));
    raw.exec("PRAGMA user_version = 1");
    raw.exec(
        "INSERT INTO journal VALUES (1, 1772344800000000, 'Dry Creek SWD 4', 'filter_1', "
        "'dp_high', 'raised', 'normal', 'unacknowledged', 'high', "
        "'sample DC4.PDT101 at 2026-03-01T06:00:00Z', '', '', 'engine', 'DC4.PDT101', "
        "'filter 1 differential pressure high', 24.5);"
        "INSERT INTO journal (seq, time_us, site, asset, check_name, event, from_state, to_state, "
        "priority, cause, who, reason, source, tag, message) VALUES (2, 1772345100000000, '', "
        "'filter_1', 'dp_high', 'acknowledged', '', '', '', '', '', '', '', '', '');"
        "INSERT INTO alert_state VALUES ('filter_1', 'dp_high', X'0102000304');"
        "INSERT INTO checkpoint VALUES ('filter_1', '3f9a0c12', 1772345100000000, X'01');");
  }
  expect_migrated_from_1_with_data(scratch.path(), version1_first_entry());
}

}  // namespace
}  // namespace bw::io
