// Runs a Python helper from tests/tools and returns what it printed.
//
// The helpers compute expected values with Python's standard library, i.e. with code this
// project did not write. When python3 (with zoneinfo) is missing the tests that need it skip,
// unless BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1, in which case they fail.
#pragma once

#include <gtest/gtest.h>

#include <array>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <unistd.h>
#include <string_view>
#include <vector>

namespace bw::io::testing {

inline bool python_reference_available() {
  static const bool available =
      std::system("python3 -c 'import zoneinfo, csv' >/dev/null 2>&1") == 0;
  return available;
}

inline bool reference_tools_required() {
  const char* flag = std::getenv("BRINEWATCH_REQUIRE_REFERENCE_TOOLS");
  return flag != nullptr && std::string_view(flag) == "1";
}

inline std::string shell_quote(std::string_view text) {
  std::string out = "'";
  for (const char c : text) {
    if (c == '\'') {
      out += "'\\''";
    } else {
      out += c;
    }
  }
  return out + "'";
}

// Runs `python3 tests/tools/<script> <args...>`, feeding `input` on stdin when it is not empty
// (through a temporary file), and returns the lines of standard output. An empty result with
// ADD_FAILURE means the script failed.
inline std::vector<std::string> run_reference_tool(std::string_view script,
                                                   const std::vector<std::string>& args,
                                                   std::string_view input = {}) {
  std::string command =
      "python3 " + shell_quote(std::string(BRINEWATCH_TEST_TOOLS) + "/" + std::string(script));
  for (const std::string& arg : args) command += " " + shell_quote(arg);
  std::string input_path;
  if (!input.empty()) {
    // One file per process: ctest runs test processes in parallel.
    input_path = ::testing::TempDir() + "brinewatch_reference_input_" + std::to_string(::getpid()) + ".txt";
    std::FILE* f = std::fopen(input_path.c_str(), "wb");
    if (f == nullptr || std::fwrite(input.data(), 1, input.size(), f) != input.size()) {
      ADD_FAILURE() << "cannot write " << input_path;
      if (f != nullptr) std::fclose(f);
      return {};
    }
    std::fclose(f);
    command += " < " + shell_quote(input_path);
  }
  std::FILE* pipe = ::popen(command.c_str(), "r");
  if (pipe == nullptr) {
    ADD_FAILURE() << "cannot run " << command;
    return {};
  }
  std::vector<std::string> lines;
  std::string current;
  std::array<char, 4096> buffer{};
  std::size_t n = 0;
  while ((n = std::fread(buffer.data(), 1, buffer.size(), pipe)) > 0) {
    for (std::size_t i = 0; i < n; ++i) {
      if (buffer[i] == '\n') {
        lines.push_back(current);
        current.clear();
      } else {
        current += buffer[i];
      }
    }
  }
  const int status = ::pclose(pipe);
  if (!input_path.empty()) std::remove(input_path.c_str());
  if (status != 0) {
    ADD_FAILURE() << "reference tool failed: " << command;
    return {};
  }
  return lines;
}

}  // namespace bw::io::testing

// Skips the current test (or fails it, when reference tools are required) without python3.
#define BW_NEED_PYTHON_REFERENCE()                                                            \
  do {                                                                                        \
    if (!::bw::io::testing::python_reference_available()) {                                   \
      if (::bw::io::testing::reference_tools_required()) {                                    \
        FAIL() << "python3 with zoneinfo is required (BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1)"; \
      }                                                                                       \
      GTEST_SKIP() << "python3 with zoneinfo not available";                                  \
    }                                                                                         \
  } while (false)
