// Test support: running the general-purpose reference tools (Rscript with r-cran-spc, python3
// with numpy) that some reference tests compare against at test time.
//
// A test that needs a tool starts with BW_REQUIRE_REFERENCE_TOOL(found, "what"): when the tool is
// missing the test is skipped with a message, or fails when the environment variable
// BRINEWATCH_REQUIRE_REFERENCE_TOOLS is 1 (for CI machines that must run everything).
#pragma once

#include <gtest/gtest.h>

#include <optional>
#include <string>
#include <vector>

namespace bw::test {

// True when BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1.
bool reference_tools_required();

// Runs `command` through /bin/sh; its standard output, or nullopt when it exits non-zero.
std::optional<std::string> run_command(const std::string& command);

// A python3 that can import numpy (tries /usr/bin/python3, then python3 on PATH), or nullopt.
std::optional<std::string> find_python_with_numpy();

// True when Rscript is on PATH and can load the spc package.
bool rscript_with_spc_available();

// The numbers in `text`, one per whitespace-separated word; nullopt if any word is not a number.
std::optional<std::vector<double>> parse_numbers(const std::string& text);

// Absolute path of a script in tests/tools.
std::string tool_path(const std::string& name);

}  // namespace bw::test

#define BW_REQUIRE_REFERENCE_TOOL(found, what)                                         \
  do {                                                                                 \
    if (!(found)) {                                                                    \
      if (::bw::test::reference_tools_required()) FAIL() << (what) << " not found";    \
      GTEST_SKIP() << (what) << " not found; set BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1" \
                   << " to make this a failure";                                       \
    }                                                                                  \
  } while (false)
