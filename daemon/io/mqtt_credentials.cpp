#include "io/mqtt_credentials.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <string_view>

namespace bw::io {

namespace {

// A password file has no business being large; the cap keeps a wrong path (a log, a device)
// from being read whole.
constexpr std::size_t kMaxFileBytes = 4096;

Error credentials_error(const std::string& path, std::string_view reason) {
  return Error{"credentials file '" + path + "': " + std::string(reason)};
}

std::string octal_mode(mode_t mode) {
  char text[8];
  std::snprintf(text, sizeof text, "%04o", static_cast<unsigned>(mode & 07777));
  return text;
}

std::string_view without_cr(std::string_view line) {
  if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
  return line;
}

}  // namespace

Result<MqttCredentials> read_mqtt_credentials(const std::string& path) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return credentials_error(path, std::string("cannot open: ") + std::strerror(errno));
  struct stat info {};
  if (::fstat(fd, &info) != 0 || !S_ISREG(info.st_mode)) {
    ::close(fd);
    return credentials_error(path, "not a regular file");
  }
  if ((info.st_mode & 077) != 0) {
    ::close(fd);
    return credentials_error(path, "group or others have access (mode " + octal_mode(info.st_mode) +
                                       "); the password must be private: run 'chmod 600 " + path +
                                       "'");
  }
  std::string text(kMaxFileBytes + 1, '\0');
  std::size_t size = 0;
  while (size < text.size()) {
    const ssize_t n = ::read(fd, text.data() + size, text.size() - size);
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) {
      const int saved = errno;
      ::close(fd);
      return credentials_error(path, std::string("cannot read: ") + std::strerror(saved));
    }
    if (n == 0) break;
    size += static_cast<std::size_t>(n);
  }
  ::close(fd);
  if (size > kMaxFileBytes) {
    return credentials_error(path, "larger than " + std::to_string(kMaxFileBytes) + " bytes");
  }
  text.resize(size);

  std::string_view rest = text;
  const std::size_t first_end = rest.find('\n');
  if (first_end == std::string_view::npos) {
    return credentials_error(path, "needs two lines (user name, then password); found one");
  }
  const std::string_view username = without_cr(rest.substr(0, first_end));
  rest.remove_prefix(first_end + 1);
  const std::size_t second_end = rest.find('\n');
  const std::string_view password = without_cr(rest.substr(0, second_end));
  if (second_end != std::string_view::npos && second_end + 1 != rest.size()) {
    return credentials_error(path, "has text after line 2; expected only user name and password");
  }
  if (username.empty()) return credentials_error(path, "line 1 (user name) is empty");
  if (password.empty()) return credentials_error(path, "line 2 (password) is empty");
  return MqttCredentials{std::string(username), std::string(password)};
}

}  // namespace bw::io
