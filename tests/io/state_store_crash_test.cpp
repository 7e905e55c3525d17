// Crash safety of the state store: a writer process (state_store_crash_writer) commits batches in
// a loop and is killed with SIGKILL at a random moment, 25 times over the same store. After each
// kill the store must open without being moved aside, pass SQLite's own integrity_check, have a
// journal numbered 1, 2, 3... with nothing lost that the writer was told was committed, and hold
// every batch whole or not at all, across the journal, the alert record, the checkpoint and the
// meta key.
#include <gtest/gtest.h>
#include <poll.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "io/state_store.h"
#include "state_store_testing.h"

extern char** environ;

namespace bw::io {
namespace {

namespace fs = std::filesystem;
using testing::RawDatabase;
using testing::ScratchDir;

constexpr int kRuns = 25;

struct Killed {
  std::int64_t last_reported_seq = 0;  // 0 when the writer reported no commit
  int lines = 0;
  bool killed_by_us = false;
  int exit_code = -1;
};

// Starts the writer, kills it after `delay`, and collects what it printed.
Killed run_writer_and_kill(const fs::path& dir, unsigned seed, std::chrono::milliseconds delay) {
  Killed result;
  int out[2];
  if (::pipe(out) != 0) {
    ADD_FAILURE() << "pipe failed";
    return result;
  }
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_adddup2(&actions, out[1], STDOUT_FILENO);
  posix_spawn_file_actions_addclose(&actions, out[0]);
  posix_spawn_file_actions_addclose(&actions, out[1]);
  const std::string program = STATE_STORE_CRASH_WRITER;
  const std::string dir_text = dir.string();
  const std::string seed_text = std::to_string(seed);
  std::vector<char*> argv = {const_cast<char*>(program.c_str()),
                             const_cast<char*>(dir_text.c_str()),
                             const_cast<char*>(seed_text.c_str()), nullptr};
  pid_t pid = 0;
  const int spawned = posix_spawn(&pid, program.c_str(), &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  ::close(out[1]);
  if (spawned != 0) {
    ::close(out[0]);
    ADD_FAILURE() << "cannot start " << program;
    return result;
  }

  std::string printed;
  const auto read_some = [&](int timeout_ms) {
    pollfd ready{out[0], POLLIN, 0};
    if (::poll(&ready, 1, timeout_ms) <= 0) return true;
    char buffer[4096];
    const ssize_t n = ::read(out[0], buffer, sizeof buffer);
    if (n <= 0) return false;  // end of output
    printed.append(buffer, static_cast<std::size_t>(n));
    return true;
  };
  // Keep the pipe drained while waiting, so the writer never blocks on a full pipe.
  const auto deadline = std::chrono::steady_clock::now() + delay;
  bool open = true;
  while (open && std::chrono::steady_clock::now() < deadline) {
    const auto left = std::chrono::duration_cast<std::chrono::milliseconds>(
        deadline - std::chrono::steady_clock::now());
    open = read_some(static_cast<int>(std::max<std::int64_t>(left.count(), 0)));
  }
  ::kill(pid, SIGKILL);
  while (read_some(-1)) {
  }
  ::close(out[0]);
  int status = 0;
  ::waitpid(pid, &status, 0);
  result.killed_by_us = WIFSIGNALED(status) && WTERMSIG(status) == SIGKILL;
  if (WIFEXITED(status)) result.exit_code = WEXITSTATUS(status);

  // Only complete lines count: the writer may die half-way through printing one.
  std::size_t start = 0;
  for (std::size_t end = printed.find('\n'); end != std::string::npos;
       start = end + 1, end = printed.find('\n', start)) {
    result.last_reported_seq = std::stoll(printed.substr(start, end - start));
    ++result.lines;
  }
  return result;
}

struct BatchPart {
  long long batch = 0, entry = 0, count = 0;
};

BatchPart parse_message(const std::string& message) {
  BatchPart part;
  if (std::sscanf(message.c_str(), "batch %lld entry %lld of %lld", &part.batch, &part.entry,
                  &part.count) != 3) {
    ADD_FAILURE() << "unexpected journal message: " << message;
  }
  return part;
}

// Checks the store after a kill; returns the number of complete batches in it.
long long check_store(const fs::path& dir, std::int64_t last_reported_seq) {
  StoreOpenReport report;
  auto opened = StateStore::open(dir, report);
  if (!opened) {
    ADD_FAILURE() << opened.error().message;
    return 0;
  }
  const StateStore& store = *opened.value();
  EXPECT_FALSE(report.moved_aside) << report.problem;

  const auto journal = store.read_journal(0, std::numeric_limits<std::size_t>::max()).value();
  EXPECT_GE(static_cast<std::int64_t>(journal.size()), last_reported_seq)
      << "a commit reported to the writer was lost";
  long long batch = 0;
  for (std::size_t i = 0; i < journal.size();) {
    EXPECT_EQ(journal[i].seq, static_cast<std::int64_t>(i) + 1) << "journal seq has a gap";
    const BatchPart first = parse_message(journal[i].message);
    EXPECT_EQ(first.batch, batch + 1) << "a batch is missing before seq " << journal[i].seq;
    EXPECT_EQ(first.entry, 1) << "batch " << first.batch << " lost its start";
    batch = first.batch;
    for (long long k = 1; k <= first.count; ++k, ++i) {
      if (i >= journal.size()) {
        ADD_FAILURE() << "batch " << batch << " is cut short at the end of the journal";
        return batch;
      }
      const BatchPart part = parse_message(journal[i].message);
      EXPECT_EQ(journal[i].seq, static_cast<std::int64_t>(i) + 1) << "journal seq has a gap";
      if (part.batch != batch || part.entry != k || part.count != first.count) {
        ADD_FAILURE() << "batch " << batch << " is not whole at seq " << journal[i].seq << ": "
                      << journal[i].message;
        return batch;
      }
    }
  }

  // The other parts of the newest batch landed with its journal entries, and nothing newer.
  const std::string b = std::to_string(batch);
  EXPECT_EQ(store.meta("last_batch").value().value_or("0"), b);
  const auto alerts = store.load_alerts().value();
  const auto checkpoints = store.load_checkpoints().value();
  if (batch == 0) {
    EXPECT_TRUE(alerts.empty());
    EXPECT_TRUE(checkpoints.empty());
  } else {
    EXPECT_EQ(
        alerts,
        (std::vector<AlertRecord>{{"filter_1", "dp_high", b + std::string(batch % 64, '\0')}}));
    EXPECT_EQ(checkpoints.size(), 1u);
    if (!checkpoints.empty()) {
      EXPECT_EQ(checkpoints[0].definition_hash, "batch " + b);
      EXPECT_EQ(checkpoints[0].taken_at_us, batch);
      EXPECT_EQ(checkpoints[0].state.size(), static_cast<std::size_t>(batch * 37 % 5000));
    }
  }
  opened.value().reset();
  // SQLite's full check of the file, on a connection of its own.
  RawDatabase raw(dir / StateStore::kFileName);
  EXPECT_EQ(raw.column("PRAGMA integrity_check"), std::vector<std::string>{"ok"});
  return batch;
}

TEST(StateStoreCrash, KilledWriterLeavesAConsistentStoreEveryTime) {
  ScratchDir scratch;
  std::mt19937 random(20260301);  // fixed: the same kill moments every run
  std::uniform_int_distribution<int> delay_ms(50, 300);
  int runs_with_commits = 0;
  long long batches = 0;
  for (int run = 0; run < kRuns; ++run) {
    const auto delay = std::chrono::milliseconds(delay_ms(random));
    const Killed killed =
        run_writer_and_kill(scratch.path(), static_cast<unsigned>(random()), delay);
    ASSERT_TRUE(killed.killed_by_us) << "run " << run << ": the writer stopped by itself with "
                                     << killed.exit_code << " before the kill";
    if (killed.lines > 0) ++runs_with_commits;
    SCOPED_TRACE("run " + std::to_string(run) + ", killed after " + std::to_string(delay.count()) +
                 " ms");
    const long long now = check_store(scratch.path(), killed.last_reported_seq);
    EXPECT_GE(now, batches) << "complete batches disappeared";
    batches = now;
    if (HasFailure()) return;
  }
  std::printf(
      "%d kills, %d of them after at least one reported commit; %lld batches in the "
      "store\n",
      kRuns, runs_with_commits, batches);
  // Without commits to interrupt the test would prove nothing.
  EXPECT_GT(runs_with_commits, kRuns / 2);
}

}  // namespace
}  // namespace bw::io
