// Durable state through the replay verb: a replay split by a restart gives the same journal and
// alerts as one run, and a replay killed at random moments resumes to the very same journal.
#include <gtest/gtest.h>
#include <signal.h>
#include <spawn.h>

#include <chrono>
#include <cmath>
#include <map>
#include <random>
#include <thread>

#include "io/state_store.h"
#include "run_command.h"

extern char** environ;

namespace {

namespace fs = std::filesystem;
using bw::testing::lines_of;
using bw::testing::run_brinewatch;

constexpr double kCycleHours = 6.0;

std::string iso(std::int64_t minute) {
  const std::time_t t = 1772323200 + minute * 60;  // 2026-03-01T00:00:00Z
  std::tm tm{};
  gmtime_r(&t, &tm);
  char text[32];
  std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return text;
}

// An invented tank whose level swings across its 15 ft high limit every six hours, with a
// little noise from a fixed seed.
void write_history(const fs::path& file, std::int64_t first_minute, std::int64_t end_minute) {
  std::ofstream out(file);
  out << "time,TF1.TK1.LEVEL\n";
  std::mt19937_64 random(5);
  std::uniform_real_distribution<double> noise(-0.05, 0.05);
  for (std::int64_t m = 0; m < end_minute; ++m) {
    const double level = 12.0 + 4.0 * std::sin(2 * M_PI * static_cast<double>(m) / (kCycleHours * 60)) + noise(random);
    if (m >= first_minute) out << iso(m) << ',' << level << '\n';
  }
}

// Acknowledgements at each peak, a shelve, and a refused shelve with a negative duration.
void write_commands(const fs::path& file, int days) {
  std::ofstream out(file);
  out << "time,command,asset,check,who,reason,duration\n";
  for (std::int64_t cycle = 0; cycle < days * 24 / static_cast<int>(kCycleHours); ++cycle) {
    const std::int64_t peak = cycle * static_cast<std::int64_t>(kCycleHours * 60) + 90;
    out << iso(peak) << ",acknowledge,tank_a,level_high,Dana Ortiz,seen,\n";
  }
  out << iso(2 * 1440 + 30) << ",shelve,tank_a,level_high,Dana Ortiz,transmitter work,12h\n";
  out << iso(3 * 1440 + 30) << ",shelve,tank_a,level_high,Dana Ortiz,typo,-1h\n";
}

std::vector<bw::io::JournalEntry> journal_of(const fs::path& state_dir) {
  bw::io::StoreOpenReport report;
  auto store = bw::io::StateStore::open(state_dir, report);
  EXPECT_TRUE(store.ok());
  if (!store) return {};
  EXPECT_FALSE(report.moved_aside.has_value()) << report.problem;
  auto entries = store.value()->read_journal(0, 1u << 30);
  EXPECT_TRUE(entries.ok());
  return entries ? entries.value() : std::vector<bw::io::JournalEntry>{};
}

std::string replay_args(const fs::path& dir, const fs::path& input, const fs::path& state,
                        const std::string& every) {
  return "replay --config " + bw::testing::fixture_path("one-tank.yaml") + " --input " +
         input.string() + " --commands " + (dir / "commands.csv").string() + " --state " +
         state.string() + " --checkpoint-every " + every + " --alerts " +
         (dir / (state.filename().string() + "-alerts.jsonl")).string();
}

// The journal of every alert must read as one unbroken chain of states.
void expect_unbroken(const std::vector<bw::io::JournalEntry>& journal) {
  std::map<std::pair<std::string, std::string>, std::string> state_of;
  for (std::size_t i = 0; i < journal.size(); ++i) {
    const auto& e = journal[i];
    ASSERT_EQ(e.seq, static_cast<std::int64_t>(i + 1)) << "journal seqs run 1, 2, 3, ...";
    if (e.event == "command_refused") continue;
    auto [it, first] = state_of.try_emplace({e.asset, e.check}, "normal");
    EXPECT_EQ(e.from_state, it->second) << "entry " << e.seq << " " << e.asset << "/" << e.check
                                        << " " << e.event;
    it->second = e.to_state;
  }
}

void expect_same_journal(const std::vector<bw::io::JournalEntry>& a,
                         const std::vector<bw::io::JournalEntry>& b) {
  ASSERT_EQ(a.size(), b.size());
  for (std::size_t i = 0; i < a.size(); ++i) {
    EXPECT_EQ(a[i], b[i]) << "journal entry " << i + 1 << ": " << a[i].event << " vs " << b[i].event;
    if (!(a[i] == b[i])) return;
  }
}

TEST(StateReplay, ARestartBetweenTwoHalvesGivesTheSameJournalAndAlertsAsOneRun) {
  const fs::path dir = bw::testing::scratch_dir("restart");
  constexpr int kDays = 6;
  write_history(dir / "all.csv", 0, kDays * 1440);
  write_history(dir / "first.csv", 0, 3 * 1440 + 7);  // split inside a cycle, mid-alert
  write_history(dir / "second.csv", 3 * 1440 + 7, kDays * 1440);
  write_commands(dir / "commands.csv", kDays);

  const auto one = run_brinewatch(replay_args(dir, dir / "all.csv", dir / "one", "2h"));
  ASSERT_EQ(one.status, 0) << one.output;
  const auto first = run_brinewatch(replay_args(dir, dir / "first.csv", dir / "two", "2h"));
  ASSERT_EQ(first.status, 0) << first.output;
  const auto second = run_brinewatch(replay_args(dir, dir / "second.csv", dir / "two", "2h"));
  ASSERT_EQ(second.status, 0) << second.output;
  EXPECT_NE(second.output.find("resumed"), std::string::npos) << second.output;

  const auto journal = journal_of(dir / "one");
  ASSERT_GT(journal.size(), 40u);
  expect_unbroken(journal);
  expect_same_journal(journal, journal_of(dir / "two"));
  EXPECT_EQ(lines_of(dir / "one-alerts.jsonl"), lines_of(dir / "two-alerts.jsonl"));

  // The commands did what the crew meant, and the bad one was refused with its reason.
  std::map<std::string, int> events;
  for (const auto& e : journal) ++events[e.event];
  EXPECT_GT(events["acknowledged"], 10);
  EXPECT_EQ(events["shelved"], 1);
  EXPECT_EQ(events["shelve_expired"], 1);
  EXPECT_GE(events["command_refused"], 1);
  bool negative_refused = false;
  for (const auto& e : journal) {
    negative_refused |= e.event == "command_refused" && e.message.find("-3600") != std::string::npos;
  }
  EXPECT_TRUE(negative_refused);
}

pid_t spawn(const std::string& arguments) {
  // exec, so that the kill reaches brinewatch itself and not a shell around it
  const std::string command =
      "exec " + std::string(BRINEWATCH_EXE) + " " + arguments + " >/dev/null 2>&1";
  const char* argv[] = {"/bin/sh", "-c", command.c_str(), nullptr};
  pid_t pid = 0;
  if (posix_spawn(&pid, "/bin/sh", nullptr, nullptr, const_cast<char**>(argv), environ) != 0) {
    return -1;
  }
  return pid;
}

// After every crash the store opens as it is and its journal is an unbroken prefix of the
// uninterrupted run's journal: nothing half-written, nothing acknowledged forgotten.
void expect_prefix_of(const std::vector<bw::io::JournalEntry>& journal,
                      const std::vector<bw::io::JournalEntry>& expected) {
  expect_unbroken(journal);
  ASSERT_LE(journal.size(), expected.size());
  for (std::size_t i = 0; i < journal.size(); ++i) ASSERT_EQ(journal[i], expected[i]) << i;
}

TEST(StateReplay, KilledAtRandomMomentsItResumesToTheSameJournal) {
  const fs::path dir = bw::testing::scratch_dir("crash");
  constexpr int kDays = 90;
  constexpr int kKills = 20;
  write_history(dir / "all.csv", 0, kDays * 1440);
  write_commands(dir / "commands.csv", kDays);
  const auto reference = run_brinewatch(replay_args(dir, dir / "all.csv", dir / "reference", "1h"));
  ASSERT_EQ(reference.status, 0) << reference.output;
  const auto expected = journal_of(dir / "reference");
  ASSERT_GT(expected.size(), 500u);

  std::mt19937_64 random(20261202);
  std::uniform_int_distribution<int> delay_ms(20, 400);
  const fs::path state = dir / "crashy";
  const std::string args = replay_args(dir, dir / "all.csv", state, "1h");
  int kills = 0;
  int completions = 0;
  while (kills < kKills) {
    const pid_t pid = spawn(args);
    ASSERT_GT(pid, 0);
    std::this_thread::sleep_for(std::chrono::milliseconds(delay_ms(random)));
    int status = 0;
    if (waitpid(pid, &status, WNOHANG) == 0) {
      kill(pid, SIGKILL);
      waitpid(pid, &status, 0);
      ++kills;
      expect_prefix_of(journal_of(state), expected);
    } else {
      // It finished before the kill: the resumed runs must have reached the full journal.
      ASSERT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0);
      expect_same_journal(expected, journal_of(state));
      ++completions;
      fs::remove_all(state);
    }
    if (::testing::Test::HasFailure()) return;
  }
  const auto last = run_brinewatch(args);
  ASSERT_EQ(last.status, 0) << last.output;
  expect_same_journal(expected, journal_of(state));
  std::printf("[ figures  ] %d kills, %d runs completed between kills, %zu journal entries\n",
              kills, completions, expected.size());
}

}  // namespace

namespace {

// A damaged database is never silently discarded: it is moved aside, the replay starts afresh,
// and the daemon's own alert says so as the first entry of the new journal.
TEST(StateReplay, ADamagedStoreIsMovedAsideAndReportedAsAnAlert) {
  const fs::path dir = bw::testing::scratch_dir("damaged");
  write_history(dir / "all.csv", 0, 1440);
  write_commands(dir / "commands.csv", 1);
  const fs::path state = dir / "state";
  fs::create_directories(state);
  std::ofstream(state / bw::io::StateStore::kFileName) << "this is not a database, it is a note\n";

  const auto r = run_brinewatch(replay_args(dir, dir / "all.csv", state, "1h"));
  ASSERT_EQ(r.status, 0) << r.output;
  EXPECT_NE(r.output.find("was damaged"), std::string::npos) << r.output;
  int kept = 0;
  for (const auto& entry : fs::directory_iterator(state)) {
    kept += entry.path().filename().string().find(".damaged-") != std::string::npos;
  }
  EXPECT_GE(kept, 1) << "the damaged file is kept beside the new one";
  const auto journal = journal_of(state);
  ASSERT_GE(journal.size(), 2u);
  EXPECT_EQ(journal[0].asset, "brinewatch");
  EXPECT_EQ(journal[0].check, "state_store_reset");
  EXPECT_EQ(journal[0].event, "raised");
  EXPECT_EQ(journal[0].priority, "high");
  EXPECT_EQ(journal[1].event, "cleared");
  EXPECT_EQ(journal[1].to_state, "returned_unacknowledged") << "it waits for a person";
}

}  // namespace
