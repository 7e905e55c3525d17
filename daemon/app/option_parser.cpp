#include "app/option_parser.h"

#include <cstdio>
#include <string_view>

#include "config/nearest_name.h"

namespace bw::app {

void OptionParser::flag(std::string name, bool& target) {
  options_.push_back({std::move(name), Kind::flag, false, &target});
}

void OptionParser::value(std::string name, std::string& target, bool required) {
  options_.push_back({std::move(name), Kind::value, required, &target});
}

void OptionParser::values(std::string name, std::vector<std::string>& target) {
  options_.push_back({std::move(name), Kind::values, false, &target});
}

void OptionParser::positionals(std::vector<std::string>& target, std::size_t required,
                               std::size_t max) {
  positionals_ = &target;
  positionals_required_ = required;
  positionals_max_ = max;
}

bool OptionParser::fail(const std::string& message) const {
  std::fprintf(stderr, "brinewatch %s: %s\n", verb_.c_str(), message.c_str());
  return false;
}

bool OptionParser::assign(Option& option, const std::string& text) {
  option.seen = true;
  if (option.kind == Kind::value) {
    *static_cast<std::string*>(option.target) = text;
  } else {
    static_cast<std::vector<std::string>*>(option.target)->push_back(text);
  }
  return true;
}

bool OptionParser::parse(const std::vector<std::string>& args) {
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& arg = args[i];
    if (arg.rfind("--", 0) != 0) {
      if (positionals_ == nullptr || positionals_->size() >= positionals_max_) {
        return fail("unexpected argument '" + arg + "'");
      }
      positionals_->push_back(arg);
      continue;
    }
    const auto equals = arg.find('=');
    const std::string name = arg.substr(2, equals == std::string::npos ? std::string::npos : equals - 2);
    Option* option = nullptr;
    for (auto& candidate : options_) {
      if (candidate.name == name) option = &candidate;
    }
    if (option == nullptr) {
      std::vector<std::string_view> names;
      for (const auto& candidate : options_) names.push_back(candidate.name);
      return fail("unknown option '--" + name + "'" + config::did_you_mean(name, names));
    }
    if (option->kind == Kind::flag) {
      if (equals != std::string::npos) return fail("option '--" + name + "' takes no value");
      *static_cast<bool*>(option->target) = true;
      option->seen = true;
      continue;
    }
    if (equals != std::string::npos) {
      assign(*option, arg.substr(equals + 1));
    } else if (i + 1 < args.size()) {
      assign(*option, args[++i]);
    } else {
      return fail("option '--" + name + "' needs a value");
    }
  }
  for (const auto& option : options_) {
    if (option.required && !option.seen) return fail("option '--" + option.name + "' is required");
  }
  if (positionals_ != nullptr && positionals_->size() < positionals_required_) {
    return fail("missing argument; see 'brinewatch help'");
  }
  return true;
}

}  // namespace bw::app
