// Running the brinewatch executable from a test and reading what it wrote.
#pragma once

#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace bw::testing {

struct CommandResult {
  int status = -1;
  std::string output;  // stdout and stderr together
};

inline CommandResult run_brinewatch(const std::string& arguments) {
  const std::string command = std::string(BRINEWATCH_EXE) + " " + arguments + " 2>&1";
  CommandResult result;
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return result;
  char buffer[4096];
  while (std::size_t n = std::fread(buffer, 1, sizeof buffer, pipe)) result.output.append(buffer, n);
  const int raw = pclose(pipe);
  result.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  return result;
}

// A folder for one test process (ctest runs each test in its own process), under temp space.
inline std::filesystem::path scratch_dir(const std::string& name) {
  const auto dir = std::filesystem::temp_directory_path() /
                   ("brinewatch-test-" + std::to_string(::getpid())) / name;
  std::filesystem::create_directories(dir);
  return dir;
}

inline std::vector<std::string> lines_of(const std::filesystem::path& file) {
  std::ifstream in(file);
  std::vector<std::string> lines;
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

inline std::string fixture_path(const std::string& name) {
  return std::string(BRINEWATCH_SOURCE_DIR) + "/tests/app/fixtures/" + name;
}

}  // namespace bw::testing
