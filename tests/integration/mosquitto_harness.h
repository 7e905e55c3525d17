// A real mosquitto broker for tests, on a fresh loopback port, in a temporary directory.
//
// MosquittoHarness writes a generated mosquitto.conf (listener on 127.0.0.1 only, persistence
// in the temporary directory with a one-second autosave so that a session survives SIGKILL,
// optional password file, optional TLS listener) and runs `mosquitto -c mosquitto.conf` by
// fork/exec. start() returns once the broker accepts TCP connections; stop() sends SIGTERM,
// kill() SIGKILL, and start() after either brings the broker back on the same port with the
// same persistence file. The destructor kills a broker still running and removes the
// directory, so a failing test leaks no process; the child also gets SIGKILL if the test
// process dies (PR_SET_PDEATHSIG).
//
// make_tls_files() creates a CA, a server certificate for 127.0.0.1 / localhost signed by it,
// and a client certificate, with `openssl req` and `openssl x509`, using P-256 keys (fast to
// make) valid for two days.
//
// Thread safety: none; use one harness from one thread. The mosquitto binary lives in
// /usr/sbin, which find_program() searches even when PATH lacks it.
#pragma once

#include <sys/types.h>

#include <chrono>
#include <string>
#include <utility>
#include <vector>

#include "core/result.h"

namespace bw::testing {

// Full path of an executable found in PATH, /usr/sbin, /usr/local/sbin or /sbin; "" if none.
std::string find_program(const std::string& name);

// Runs argv (argv[0] is looked up with find_program), appending its standard output and error
// to `log_path`, and waits. Returns the exit status, or -1 when it could not run or was killed.
int run_program(const std::vector<std::string>& argv, const std::string& log_path);

// True when mosquitto, mosquitto_pub, mosquitto_passwd and openssl are all installed.
bool broker_tools_available();

struct TlsFiles {
  std::string ca_cert;
  std::string ca_key;
  std::string server_cert;
  std::string server_key;
  std::string client_cert;
  std::string client_key;
};

// Creates the files in `dir`, each name starting with `prefix` (use two prefixes for two
// unrelated CAs). Errors quote the log of the openssl commands.
Result<TlsFiles> make_tls_files(const std::string& dir, const std::string& prefix);

struct BrokerOptions {
  bool tls = false;                         // the listener speaks TLS with make_tls_files()
  bool require_client_certificate = false;  // only with tls
  std::vector<std::pair<std::string, std::string>> users;  // non-empty: no anonymous clients
};

class MosquittoHarness {
 public:
  explicit MosquittoHarness(BrokerOptions options = {});
  ~MosquittoHarness();
  MosquittoHarness(const MosquittoHarness&) = delete;
  MosquittoHarness& operator=(const MosquittoHarness&) = delete;

  // Starts the broker; the first call picks the port (and makes TLS and password files).
  Status start();
  void stop();  // SIGTERM, then waits; mosquitto saves its persistence file on the way out
  void kill();  // SIGKILL, then waits; only what autosave wrote survives
  bool running() const { return pid_ > 0; }

  // Waits until the broker writes its persistence file after this call (autosave runs about
  // once a second), so that what it holds now survives kill(). False after `timeout`.
  bool wait_for_autosave(std::chrono::milliseconds timeout = std::chrono::seconds(5)) const;

  int port() const { return port_; }
  std::string uri() const;  // "tcp://127.0.0.1:<port>" or "ssl://127.0.0.1:<port>"
  const std::string& dir() const { return dir_; }
  const TlsFiles& tls_files() const { return tls_files_; }
  std::string log() const;  // the broker's log so far

  // Runs mosquitto_pub against this broker (adding host, port, TLS files and the first user's
  // credentials when the broker needs them) with `args` after them; true on exit status 0.
  bool mosquitto_pub(const std::vector<std::string>& args) const;

 private:
  Status prepare();
  Status spawn_and_wait();
  void signal_and_reap(int signal_number);

  BrokerOptions options_;
  std::string dir_;
  std::string config_path_;
  std::string log_path_;
  TlsFiles tls_files_;
  int port_ = 0;
  pid_t pid_ = -1;
};

}  // namespace bw::testing
