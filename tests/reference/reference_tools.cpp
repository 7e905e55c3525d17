#include "reference_tools.h"

#include <sys/wait.h>

#include <array>
#include <cstdio>
#include <cstdlib>
#include <sstream>

namespace bw::test {

bool reference_tools_required() {
  const char* value = std::getenv("BRINEWATCH_REQUIRE_REFERENCE_TOOLS");
  return value != nullptr && std::string(value) == "1";
}

std::optional<std::string> run_command(const std::string& command) {
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return std::nullopt;
  std::string output;
  std::array<char, 4096> buffer{};
  std::size_t n = 0;
  while ((n = std::fread(buffer.data(), 1, buffer.size(), pipe)) > 0)
    output.append(buffer.data(), n);
  const int status = pclose(pipe);
  if (status == -1 || !WIFEXITED(status) || WEXITSTATUS(status) != 0) return std::nullopt;
  return output;
}

std::optional<std::string> find_python_with_numpy() {
  for (const std::string candidate : {"/usr/bin/python3", "python3"}) {
    if (run_command(candidate + " -c 'import numpy' 2>/dev/null")) return candidate;
  }
  return std::nullopt;
}

bool rscript_with_spc_available() {
  return run_command("Rscript -e 'suppressMessages(library(spc))' >/dev/null 2>&1").has_value();
}

std::optional<std::vector<double>> parse_numbers(const std::string& text) {
  std::istringstream in(text);
  std::vector<double> numbers;
  std::string word;
  while (in >> word) {
    std::size_t used = 0;
    try {
      numbers.push_back(std::stod(word, &used));
    } catch (const std::exception&) {
      return std::nullopt;
    }
    if (used != word.size()) return std::nullopt;
  }
  return numbers;
}

std::string tool_path(const std::string& name) {
  return std::string(BRINEWATCH_TEST_TOOLS) + "/" + name;
}

}  // namespace bw::test
