// brinewatch: advisory condition monitoring for produced-water disposal facilities.
#include <cstdio>
#include <string>
#include <string_view>

#include "app/verbs.h"
#include "app/version.h"

namespace {

constexpr std::string_view kUsage = R"(usage: brinewatch <verb> [options]

verbs:
  run --config SITE.yaml [--rules DIR]...
        the live daemon: read the tag streams named in the site's 'live:' section from the
        MQTT broker, publish alerts, keep state; stops cleanly on SIGINT or SIGTERM
  check SITE.yaml [--rules DIR]...
        validate a site file and its rule templates; print the compiled asset graph
  replay --config SITE.yaml --input HISTORY.csv [--alerts OUT.jsonl] [--strict]
         [--ignore-column NAME]... [--rules DIR]... [--commands COMMANDS.csv]
         [--notifications OUT.jsonl] [--records OUT.jsonl]
         [--state DIR [--checkpoint-every DURATION]]
        run a history file through the engine and write every alert transition;
        --commands applies the crew's commands at their times, --notifications writes
        what the crews would be told (chattering and floods held back), --records writes
        the records closed (daily injection figures, change-outs), --state keeps (and
        resumes from) durable state in DIR
  demo [--dir DIR]
        write the built-in example site and an invented history to DIR (default: a new
        temporary folder) and replay it
  state --dir DIR [--journal N]
        show what a state store holds: position, checkpoints, the last N journal entries,
        and the site's health (which assets need a person, how badly, since when)
  state --rank DIR...
        read the state stores of several sites and list the sites in visit order
  version
        print the version

brinewatch is an advisory tool, not a safety system: it never replaces the site's shutdowns,
safety instrumented systems, permit conditions or the judgement of qualified personnel.
)";

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fputs(kUsage.data(), stderr);
    return 2;
  }
  const std::string_view verb = argv[1];
  const bw::app::Arguments args(argv + 2, argv + argc);
  if (verb == "check") return bw::app::run_check(args);
  if (verb == "replay") return bw::app::run_replay(args);
  if (verb == "demo") return bw::app::run_demo(args);
  if (verb == "state") return bw::app::run_state(args);
  if (verb == "run") return bw::app::run_live(args);
  if (verb == "version" || verb == "--version") {
    std::printf("brinewatch %s\n", bw::app::kVersion);
    return 0;
  }
  if (verb == "help" || verb == "--help" || verb == "-h") {
    std::fputs(kUsage.data(), stdout);
    return 0;
  }
  std::fprintf(stderr, "brinewatch: unknown verb '%.*s'\n\n%s", static_cast<int>(verb.size()),
               verb.data(), kUsage.data());
  return 2;
}
