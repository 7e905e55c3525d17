// The command-line verbs of the brinewatch executable. Each takes the arguments after the verb
// and returns the process exit status: 0 success, 1 the work failed (unreadable input, strict
// mode stopped on a bad row, alerts could not be written), 2 bad usage or configuration.
#pragma once

#include <string>
#include <vector>

namespace bw::app {

using Arguments = std::vector<std::string>;

int run_check(const Arguments& args);
int run_replay(const Arguments& args);
int run_demo(const Arguments& args);
int run_state(const Arguments& args);
int run_live(const Arguments& args);

}  // namespace bw::app
