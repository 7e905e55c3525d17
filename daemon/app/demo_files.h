// The demo's site file and rule template, compiled into the executable from
// config-examples/dry-creek-swd4-tanks.yaml and rules/tank_level.yaml.
#pragma once

#include <string_view>

namespace bw::app {

extern const std::string_view kDemoSiteYaml;
extern const std::string_view kDemoRulesYaml;

}  // namespace bw::app
