#include "mosquitto_harness.h"

#include <arpa/inet.h>
#include <fcntl.h>
#include <netinet/in.h>
#include <pwd.h>
#include <signal.h>
#include <sys/prctl.h>
#include <sys/socket.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <thread>

namespace bw::testing {

namespace {

constexpr auto kStartTimeout = std::chrono::seconds(5);
constexpr auto kPollInterval = std::chrono::milliseconds(5);
// A freshly picked port can be taken by someone else before mosquitto binds it.
constexpr int kPortAttempts = 3;

sockaddr_in loopback(int port) {
  sockaddr_in address{};
  address.sin_family = AF_INET;
  address.sin_port = htons(static_cast<std::uint16_t>(port));
  address.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
  return address;
}

// Binds 127.0.0.1:0 and reads back the port the kernel chose.
Result<int> pick_free_port() {
  const int fd = ::socket(AF_INET, SOCK_STREAM | SOCK_CLOEXEC, 0);
  if (fd < 0) return Error{std::string("socket: ") + std::strerror(errno)};
  sockaddr_in address = loopback(0);
  socklen_t length = sizeof address;
  if (::bind(fd, reinterpret_cast<sockaddr*>(&address), sizeof address) != 0 ||
      ::getsockname(fd, reinterpret_cast<sockaddr*>(&address), &length) != 0) {
    const int saved = errno;
    ::close(fd);
    return Error{std::string("cannot pick a loopback port: ") + std::strerror(saved)};
  }
  ::close(fd);
  return static_cast<int>(ntohs(address.sin_port));
}

bool accepts_connections(int port) {
  const int fd = ::socket(AF_INET, SOCK_STREAM | SOCK_CLOEXEC, 0);
  if (fd < 0) return false;
  const sockaddr_in address = loopback(port);
  const bool ok = ::connect(fd, reinterpret_cast<const sockaddr*>(&address), sizeof address) == 0;
  ::close(fd);
  return ok;
}

std::string read_file(const std::string& path) {
  std::ifstream in(path);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

bool is_executable(const std::string& path) { return ::access(path.c_str(), X_OK) == 0; }

std::string current_user() {
  const passwd* entry = ::getpwuid(::geteuid());
  return entry != nullptr ? entry->pw_name : "root";
}

// The argv vector execv wants, built before fork so the child only calls async-signal-safe
// functions.
std::vector<char*> exec_argv(std::vector<std::string>& args) {
  std::vector<char*> argv;
  for (std::string& arg : args) argv.push_back(arg.data());
  argv.push_back(nullptr);
  return argv;
}

// Forks and execs `args` with standard output and error appended to `log_path`. The child is
// killed if the test process dies. Returns the child's pid or -1.
pid_t spawn(std::vector<std::string> args, const std::string& log_path) {
  std::vector<char*> argv = exec_argv(args);
  const pid_t parent = ::getpid();
  const pid_t pid = ::fork();
  if (pid != 0) return pid;
  ::prctl(PR_SET_PDEATHSIG, SIGKILL);
  if (::getppid() != parent) ::_exit(127);
  const int log_fd = ::open(log_path.c_str(), O_WRONLY | O_CREAT | O_APPEND, 0600);
  if (log_fd >= 0) {
    ::dup2(log_fd, STDOUT_FILENO);
    ::dup2(log_fd, STDERR_FILENO);
  }
  const int null_fd = ::open("/dev/null", O_RDONLY);
  if (null_fd >= 0) ::dup2(null_fd, STDIN_FILENO);
  ::execv(argv[0], argv.data());
  ::_exit(127);
}

int wait_exit_status(pid_t pid) {
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0) {
    if (errno != EINTR) return -1;
  }
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

}  // namespace

std::string find_program(const std::string& name) {
  std::vector<std::string> directories;
  if (const char* path = std::getenv("PATH")) {
    std::stringstream list(path);
    for (std::string entry; std::getline(list, entry, ':');) {
      if (!entry.empty()) directories.push_back(entry);
    }
  }
  for (const char* extra : {"/usr/sbin", "/usr/local/sbin", "/sbin"}) directories.push_back(extra);
  for (const std::string& directory : directories) {
    const std::string candidate = directory + "/" + name;
    if (is_executable(candidate)) return candidate;
  }
  return "";
}

int run_program(const std::vector<std::string>& argv, const std::string& log_path) {
  std::vector<std::string> args = argv;
  args[0] = find_program(argv[0]);
  if (args[0].empty()) return -1;
  const pid_t pid = spawn(std::move(args), log_path);
  return pid < 0 ? -1 : wait_exit_status(pid);
}

bool broker_tools_available() {
  for (const char* tool : {"mosquitto", "mosquitto_pub", "mosquitto_passwd", "openssl"}) {
    if (find_program(tool).empty()) return false;
  }
  return true;
}

Result<TlsFiles> make_tls_files(const std::string& dir, const std::string& prefix) {
  const std::string base = dir + "/" + prefix;
  const std::string log = base + "-openssl.log";
  TlsFiles files{base + "-ca.crt",     base + "-ca.key",     base + "-server.crt",
                 base + "-server.key", base + "-client.crt", base + "-client.key"};
  const std::vector<std::string> new_key = {"-newkey", "ec", "-pkeyopt",
                                            "ec_paramgen_curve:prime256v1", "-nodes"};
  const std::string organisation = "/O=Tumbleweed Water Services";

  auto run = [&](std::vector<std::string> argv) { return run_program(argv, log) == 0; };
  auto with_key = [&](std::vector<std::string> head, std::vector<std::string> tail) {
    head.insert(head.end(), new_key.begin(), new_key.end());
    head.insert(head.end(), tail.begin(), tail.end());
    return head;
  };
  // Signs `name`'s request with the CA; `extensions` go in a file, as x509 -req wants them.
  auto sign = [&](const std::string& name, const std::string& extensions) {
    const std::string ext_path = base + "-" + name + ".ext";
    std::ofstream(ext_path) << extensions;
    return run({"openssl", "x509", "-req", "-in", base + "-" + name + ".csr", "-CA", files.ca_cert,
                "-CAkey", files.ca_key, "-CAcreateserial", "-days", "2", "-out",
                base + "-" + name + ".crt", "-extfile", ext_path});
  };
  auto request = [&](const std::string& name, const std::string& common_name) {
    return run(with_key({"openssl", "req", "-new"},
                        {"-keyout", base + "-" + name + ".key", "-out", base + "-" + name + ".csr",
                         "-subj", organisation + "/CN=" + common_name}));
  };

  const bool ok =
      run(with_key({"openssl", "req", "-x509"},
                   {"-keyout", files.ca_key, "-out", files.ca_cert, "-days", "2", "-subj",
                    organisation + "/CN=Dry Creek test CA " + prefix})) &&
      request("server", "127.0.0.1") &&
      sign("server", "subjectAltName=IP:127.0.0.1,DNS:localhost\nextendedKeyUsage=serverAuth\n") &&
      request("client", "dry-creek-swd4-edge") && sign("client", "extendedKeyUsage=clientAuth\n");
  if (!ok) return Error{"openssl failed making TLS files; log:\n" + read_file(log)};
  return files;
}

MosquittoHarness::MosquittoHarness(BrokerOptions options) : options_(std::move(options)) {
  std::string pattern =
      (std::filesystem::temp_directory_path() / "brinewatch-mosquitto-XXXXXX").string();
  if (::mkdtemp(pattern.data()) != nullptr) dir_ = pattern;
  config_path_ = dir_ + "/mosquitto.conf";
  log_path_ = dir_ + "/mosquitto.log";
}

MosquittoHarness::~MosquittoHarness() {
  if (running()) kill();
  if (!dir_.empty()) {
    std::error_code ignored;
    std::filesystem::remove_all(dir_, ignored);
  }
}

std::string MosquittoHarness::uri() const {
  return std::string(options_.tls ? "ssl" : "tcp") + "://127.0.0.1:" + std::to_string(port_);
}

std::string MosquittoHarness::log() const { return read_file(log_path_); }

Status MosquittoHarness::prepare() {
  if (dir_.empty()) return Error{"cannot create a temporary directory for mosquitto"};
  std::ofstream config(config_path_);
  config << "# Generated by the brinewatch test harness.\n"
         << "listener " << port_ << " 127.0.0.1\n"
         << "user " << current_user() << "\n"
         << "persistence true\n"
         << "persistence_location " << dir_ << "/\n"
         << "autosave_interval 1\n"
         << "log_dest file " << log_path_ << "\n"
         << "log_type error\nlog_type warning\nlog_type notice\nlog_type information\n";
  if (options_.users.empty()) {
    config << "allow_anonymous true\n";
  } else {
    const std::string password_file = dir_ + "/passwords";
    bool create = true;
    for (const auto& [user, password] : options_.users) {
      std::vector<std::string> argv = {"mosquitto_passwd", "-b"};
      if (create) argv.push_back("-c");
      argv.insert(argv.end(), {password_file, user, password});
      if (run_program(argv, dir_ + "/mosquitto_passwd.log") != 0) {
        return Error{"mosquitto_passwd failed: " + read_file(dir_ + "/mosquitto_passwd.log")};
      }
      create = false;
    }
    config << "allow_anonymous false\npassword_file " << password_file << "\n";
  }
  if (options_.tls) {
    Result<TlsFiles> files = make_tls_files(dir_, "broker");
    if (!files) return files.error();
    tls_files_ = std::move(files).value();
    config << "cafile " << tls_files_.ca_cert << "\ncertfile " << tls_files_.server_cert
           << "\nkeyfile " << tls_files_.server_key << "\nrequire_certificate "
           << (options_.require_client_certificate ? "true" : "false") << "\n";
  }
  config.close();
  if (!config) return Error{"cannot write " + config_path_};
  return Ok{};
}

Status MosquittoHarness::start() {
  if (running()) return Error{"mosquitto is already running"};
  if (port_ != 0) return spawn_and_wait();
  Status started = Error{"no attempt made"};
  for (int attempt = 0; attempt < kPortAttempts; ++attempt) {
    Result<int> port = pick_free_port();
    if (!port) return port.error();
    port_ = port.value();
    if (Status prepared = prepare(); !prepared) return prepared;
    started = spawn_and_wait();
    if (started) return started;
  }
  return started;
}

Status MosquittoHarness::spawn_and_wait() {
  const std::string binary = find_program("mosquitto");
  if (binary.empty()) return Error{"mosquitto is not installed"};
  pid_ = spawn({binary, "-c", config_path_}, dir_ + "/mosquitto.stderr");
  if (pid_ < 0) return Error{std::string("fork: ") + std::strerror(errno)};
  const auto deadline = std::chrono::steady_clock::now() + kStartTimeout;
  while (std::chrono::steady_clock::now() < deadline) {
    int status = 0;
    if (::waitpid(pid_, &status, WNOHANG) == pid_) {
      pid_ = -1;
      return Error{"mosquitto exited at start-up (status " + std::to_string(status) +
                   "); stderr:\n" + read_file(dir_ + "/mosquitto.stderr") + "log:\n" + log()};
    }
    if (accepts_connections(port_)) return Ok{};
    std::this_thread::sleep_for(kPollInterval);
  }
  kill();
  return Error{"mosquitto did not accept connections on port " + std::to_string(port_) +
               " within 5 s; log:\n" + log()};
}

void MosquittoHarness::signal_and_reap(int signal_number) {
  if (!running()) return;
  ::kill(pid_, signal_number);
  wait_exit_status(pid_);
  pid_ = -1;
}

void MosquittoHarness::stop() { signal_and_reap(SIGTERM); }
void MosquittoHarness::kill() { signal_and_reap(SIGKILL); }

bool MosquittoHarness::wait_for_autosave(std::chrono::milliseconds timeout) const {
  const std::filesystem::path database = dir_ + "/mosquitto.db";
  // A save that finishes this long after the call started after it, too: writing the small
  // test database takes well under a millisecond.
  const auto asked = std::filesystem::file_time_type::clock::now() + std::chrono::milliseconds(50);
  const auto deadline = std::chrono::steady_clock::now() + timeout;
  while (std::chrono::steady_clock::now() < deadline) {
    std::error_code missing;
    const auto written = std::filesystem::last_write_time(database, missing);
    if (!missing && written > asked) return true;
    std::this_thread::sleep_for(kPollInterval);
  }
  return false;
}

bool MosquittoHarness::mosquitto_pub(const std::vector<std::string>& args) const {
  std::vector<std::string> argv = {"mosquitto_pub", "-h", "127.0.0.1", "-p", std::to_string(port_)};
  if (options_.tls) {
    argv.insert(argv.end(), {"--cafile", tls_files_.ca_cert, "--cert", tls_files_.client_cert,
                             "--key", tls_files_.client_key});
  }
  if (!options_.users.empty()) {
    argv.insert(argv.end(),
                {"-u", options_.users.front().first, "-P", options_.users.front().second});
  }
  argv.insert(argv.end(), args.begin(), args.end());
  return run_program(argv, dir_ + "/mosquitto_pub.log") == 0;
}

}  // namespace bw::testing
