// Command-line options of one verb: declare them, then parse.
//
// Options are written "--name value" or "--name=value"; flags take no value. An unknown option
// is refused with the nearest valid one suggested; a missing required option or value is named.
// Errors are printed to stderr as "brinewatch VERB: ..." and parse() returns false.
#pragma once

#include <string>
#include <vector>

namespace bw::app {

class OptionParser {
 public:
  explicit OptionParser(std::string verb) : verb_(std::move(verb)) {}

  void flag(std::string name, bool& target);
  void value(std::string name, std::string& target, bool required = false);
  void values(std::string name, std::vector<std::string>& target);  // may repeat
  // Bare arguments, in order; `required` of them must be present, at most `max`.
  void positionals(std::vector<std::string>& target, std::size_t required, std::size_t max);

  bool parse(const std::vector<std::string>& args);

 private:
  enum class Kind { flag, value, values };
  struct Option {
    std::string name;
    Kind kind;
    bool required;
    void* target;
    bool seen = false;
  };
  bool fail(const std::string& message) const;
  bool assign(Option& option, const std::string& text);

  std::string verb_;
  std::vector<Option> options_;
  std::vector<std::string>* positionals_ = nullptr;
  std::size_t positionals_required_ = 0;
  std::size_t positionals_max_ = 0;
};

}  // namespace bw::app
