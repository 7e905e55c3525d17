// Helper of state_store_crash_test: commits batches to a state store as fast as it can until it
// is killed, and prints the journal's last seq after every commit that returned success.
//
//   state_store_crash_writer DIR SEED
//
// Batch number b continues from the store's meta key "last_batch". Each batch holds
//   - 1 to 20 journal entries whose message is "batch <b> entry <i> of <n>",
//   - the alert record (filter_1, dp_high) with state "<b>" followed by b % 64 zero bytes,
//   - the checkpoint "filter_1" with definition_hash "batch <b>", taken_at_us b and a state of
//     (b * 37) % 5000 bytes,
//   - meta last_batch = "<b>",
// so a reader can tell whether every part of every batch landed together.
//
// Exit status: 2 when the store cannot be opened or a commit fails, 3 when opening moved a file
// aside (a crash must never leave a file that looks damaged).
#include <cstdio>
#include <cstdlib>
#include <random>
#include <string>

#include "io/state_store.h"

int main(int argc, char** argv) {
  if (argc != 3) {
    std::fprintf(stderr, "usage: %s DIR SEED\n", argv[0]);
    return 2;
  }
  bw::io::StoreOpenReport report;
  auto store = bw::io::StateStore::open(argv[1], report);
  if (!store) {
    std::fprintf(stderr, "%s\n", store.error().message.c_str());
    return 2;
  }
  if (report.moved_aside) {
    std::fprintf(stderr, "moved aside: %s (%s)\n", report.moved_aside->c_str(),
                 report.problem.c_str());
    return 3;
  }
  auto last_batch = store.value()->meta("last_batch");
  if (!last_batch) {
    std::fprintf(stderr, "%s\n", last_batch.error().message.c_str());
    return 2;
  }
  long long batch = last_batch.value() ? std::stoll(*last_batch.value()) : 0;
  std::mt19937 random(static_cast<std::mt19937::result_type>(std::stoul(argv[2])));
  std::uniform_int_distribution<int> entries(1, 20);

  for (;;) {
    ++batch;
    const std::string b = std::to_string(batch);
    bw::io::StateStore::Batch work;
    const int n = entries(random);
    for (int i = 1; i <= n; ++i) {
      bw::io::JournalEntry entry;
      entry.time_us = batch;
      entry.site = "Dry Creek SWD 4";
      entry.asset = "filter_1";
      entry.check = "dp_high";
      entry.event = "raised";
      entry.cause = "crash test";
      entry.message = "batch " + b + " entry " + std::to_string(i) + " of " + std::to_string(n);
      entry.value = i;
      work.journal.push_back(std::move(entry));
    }
    work.alerts.push_back({"filter_1", "dp_high", b + std::string(batch % 64, '\0')});
    work.checkpoints.push_back({"filter_1", "batch " + b, batch,
                                std::string(static_cast<std::size_t>(batch * 37 % 5000), 'c')});
    work.meta.emplace_back("last_batch", b);
    const auto seq = store.value()->commit(work);
    if (!seq) {
      std::fprintf(stderr, "%s\n", seq.error().message.c_str());
      return 2;
    }
    std::printf("%lld\n", static_cast<long long>(seq.value()));
    std::fflush(stdout);
  }
}
