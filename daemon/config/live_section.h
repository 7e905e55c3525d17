// Reads the `live:` section of a site file into a LiveSpec (schema in live_spec.h).
//
// Besides the key tables of schema.h, the reader checks what the broker and the subscriptions
// would otherwise refuse only at run time:
// - the broker uri is tcp:// or ssl://, with a host and an optional port 1-65535;
// - ssl:// comes with `tls` and its ca_file, tcp:// without `tls`; cert_file and key_file
//   come together; every TLS file is a readable file; credentials_file exists and is a file
//   (whether it is private to its owner is checked when the daemon reads it);
// - every topic filter is a valid MQTT filter ('+' and '#' each a whole level, '#' last), no
//   filter is subscribed twice, and a sparkplug input's filter starts with spBv1.0 or a wildcard;
// - tag templates are well formed and name only placeholders of their format; a "{N}" names a
//   level the filter has, unless the filter ends in '#';
// - the output prefix has no wildcard, does not start with '$' or end with '/';
// - the command topic ends in the level '+' and has no other wildcard; authorised client ids
//   are given, non-empty and free of '/', '+' and '#';
// - state.dir, when it exists, is a folder (a missing one is created at start).
// Every problem becomes one diagnostic through the FieldReader, at the offending key or value;
// reading keeps going so that all problems of the section are reported together.
//
// Not thread-safe (appends to the reader's diagnostics); reads only file metadata and opens the
// TLS files to see that they can be read.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <string_view>

#include "config/config_node.h"
#include "config/field_reader.h"
#include "config/live_spec.h"

namespace bw::config {

// The validated section, or nothing when it had any problem (all of them reported).
// `site_name` gives the default client id and output prefix; relative file and folder names are
// resolved against `base_folder` (the site file's folder).
std::optional<LiveSpec> read_live_section(FieldReader& reader, const ConfigNode& live,
                                          std::string_view site_name,
                                          const std::filesystem::path& base_folder);

// The site name in lower case with each run of characters other than ASCII letters and digits
// written as one '-', without a leading or trailing '-': "Dry Creek SWD 4" -> "dry-creek-swd-4".
std::string site_slug(std::string_view site_name);

}  // namespace bw::config
