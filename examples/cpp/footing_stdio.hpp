// footing_stdio.hpp — a single-header client of the Footing process protocol, version 1
// (docs/protocol.md): the JSON-line handshake (hello in, ready out) and the binary f64 tick
// frames (FOOTOBS1 in, FOOTACT1 out, FOOTBYE1 or end of file to stop). C++17: the standard
// library, and POSIX read/poll/fcntl for stdin. A controller fills Action from Observation;
// run() does the wire:
//
//   struct MyController { explicit MyController(const footing::Hello&); void tick(const footing::Observation&, footing::Action&); };
//   int main() { return footing::run<MyController>({"my.telemetry"}, "my-controller 1.0"); }
//
// The tick path allocates nothing: the frames and views are sized once from the hello.
//
// Waiting for the next frame: for FOOTING_SPIN_US microseconds (set by the harness; 0 or unset:
// never) stdin is read without blocking in a loop, then the wait sleeps in poll(). On an idle
// machine this saves the ~30 µs an idle core takes to wake, at the price of a busy core while
// polling (docs/protocol.md, "Latency on idle machines"). FOOTING_SPIN_US=0 turns it off.

#pragma once

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <iostream>
#include <map>
#include <memory>
#include <stdexcept>
#include <string>
#include <vector>

#include <fcntl.h>
#include <poll.h>
#include <unistd.h>

namespace footing {

constexpr int PROTOCOL_VERSION = 1;

// ---- JSON: just enough to read the hello (objects, arrays, strings, numbers, true/false/null).

struct Json {
  enum class Kind { Null, Bool, Number, String, Array, Object } kind = Kind::Null;
  bool boolean = false;
  double number = 0.0;
  std::string text;
  std::vector<Json> items;
  std::map<std::string, Json> fields;

  const Json& operator[](const std::string& key) const {
    auto it = fields.find(key);
    if (kind != Kind::Object || it == fields.end()) throw std::runtime_error("hello: missing field " + key);
    return it->second;
  }
  const Json& operator[](std::size_t i) const {
    if (kind != Kind::Array || i >= items.size()) throw std::runtime_error("hello: index out of range");
    return items[i];
  }
  bool has(const std::string& key) const { return kind == Kind::Object && fields.count(key) > 0; }
  double num() const {
    if (kind != Kind::Number) throw std::runtime_error("hello: expected a number");
    return number;
  }
};

class JsonReader {
 public:
  explicit JsonReader(const std::string& s) : s_(s) {}
  Json parse() {
    Json value = read();
    skip();
    if (pos_ != s_.size()) fail("trailing characters");
    return value;
  }

 private:
  const std::string& s_;
  std::size_t pos_ = 0;

  [[noreturn]] void fail(const char* what) const {
    throw std::runtime_error(std::string("hello: ") + what + " at character " + std::to_string(pos_));
  }
  void skip() {
    while (pos_ < s_.size() && (s_[pos_] == ' ' || s_[pos_] == '\t' || s_[pos_] == '\n' || s_[pos_] == '\r')) ++pos_;
  }
  bool literal(const char* word) {
    std::size_t n = std::strlen(word);
    if (s_.compare(pos_, n, word) != 0) return false;
    pos_ += n;
    return true;
  }
  std::string string() {
    if (s_[pos_] != '"') fail("expected a string");
    ++pos_;
    std::string out;
    while (pos_ < s_.size() && s_[pos_] != '"') {
      char c = s_[pos_++];
      if (c != '\\') { out += c; continue; }
      if (pos_ >= s_.size()) fail("unterminated escape");
      char e = s_[pos_++];
      switch (e) {
        case 'n': out += '\n'; break;
        case 't': out += '\t'; break;
        case 'r': out += '\r'; break;
        case 'b': out += '\b'; break;
        case 'f': out += '\f'; break;
        case 'u': {
          // Names in the hello are ASCII; other code points are kept as UTF-8.
          unsigned code = static_cast<unsigned>(std::strtoul(s_.substr(pos_, 4).c_str(), nullptr, 16));
          pos_ += 4;
          if (code < 0x80) out += static_cast<char>(code);
          else if (code < 0x800) { out += static_cast<char>(0xC0 | (code >> 6)); out += static_cast<char>(0x80 | (code & 0x3F)); }
          else { out += static_cast<char>(0xE0 | (code >> 12)); out += static_cast<char>(0x80 | ((code >> 6) & 0x3F)); out += static_cast<char>(0x80 | (code & 0x3F)); }
          break;
        }
        default: out += e;  // \" \\ \/
      }
    }
    if (pos_ >= s_.size()) fail("unterminated string");
    ++pos_;
    return out;
  }
  Json read() {
    skip();
    if (pos_ >= s_.size()) fail("unexpected end");
    Json v;
    char c = s_[pos_];
    if (c == '{') {
      v.kind = Json::Kind::Object;
      ++pos_;
      skip();
      if (s_[pos_] == '}') { ++pos_; return v; }
      for (;;) {
        skip();
        std::string key = string();
        skip();
        if (s_[pos_++] != ':') fail("expected ':'");
        v.fields[key] = read();
        skip();
        if (s_[pos_] == ',') { ++pos_; continue; }
        if (s_[pos_] == '}') { ++pos_; return v; }
        fail("expected ',' or '}'");
      }
    }
    if (c == '[') {
      v.kind = Json::Kind::Array;
      ++pos_;
      skip();
      if (s_[pos_] == ']') { ++pos_; return v; }
      for (;;) {
        v.items.push_back(read());
        skip();
        if (s_[pos_] == ',') { ++pos_; continue; }
        if (s_[pos_] == ']') { ++pos_; return v; }
        fail("expected ',' or ']'");
      }
    }
    if (c == '"') { v.kind = Json::Kind::String; v.text = string(); return v; }
    if (literal("true")) { v.kind = Json::Kind::Bool; v.boolean = true; return v; }
    if (literal("false")) { v.kind = Json::Kind::Bool; return v; }
    if (literal("null")) return v;
    // strtod rounds correctly (glibc, and C++17 from_chars where present): the harness writes the
    // shortest round-trip text, so the double read is the double sent.
    const char* start = s_.c_str() + pos_;
    char* end = nullptr;
    v.kind = Json::Kind::Number;
    v.number = std::strtod(start, &end);
    if (end == start) fail("expected a value");
    pos_ += static_cast<std::size_t>(end - start);
    return v;
  }
};

// ---- The setup and the per-tick views (docs/protocol.md "f64 frames").

/** The hello, parsed: the fields a controller usually needs, and the whole message as Json. */
struct Hello {
  Json message;
  int footCount = 0;
  double controlRate_Hz = 0.0;
  double physicsStep_s = 0.0;
  double gravity_mps2[3] = {0.0, 0.0, 0.0};
  const Json& robot() const { return message["robot"]; }
  /** A numeric option of the build spec (?key=value), or the fallback when absent. */
  double option(const std::string& key, double fallback) const {
    if (!message.has("options") || !message["options"].has(key)) return fallback;
    const Json& value = message["options"][key];
    if (value.kind != Json::Kind::Number || !std::isfinite(value.number)) throw std::runtime_error("option " + key + ": expected a finite number");
    return value.number;
  }
  bool offers(const std::string& encoding) const {
    if (!message.has("encodings")) return encoding == "json";
    for (const Json& e : message["encodings"].items) if (e.text == encoding) return true;
    return false;
  }
};

/** Pointers into the obs frame: vectors flat, foot i at [3i, 3i+3). */
struct Observation {
  double tick = 0.0;
  double time_s = 0.0;
  const double* trunkPosition_m = nullptr;
  const double* trunkQuaternion = nullptr;  // w, x, y, z; trunk → world
  const double* trunkVelocity_mps = nullptr;
  const double* trunkAngularVelocity_radps = nullptr;  // trunk frame
  const double* footPosition_m = nullptr;
  const double* footVelocity_mps = nullptr;
  const double* footForce_N = nullptr;
  const double* footContact = nullptr;
  const double* frictionEstimate = nullptr;
  double gait = 0.0;  // 0 stand, 1 trot
  const double* commandVelocity_mps = nullptr;
  double commandYawRate_radps = 0.0;
};

/** Pointers into the act frame: write every field each tick. */
struct Action {
  double* mode = nullptr;  // exactly 0 (swing) or 1 (stance)
  double* groundForce_N = nullptr;
  double* footTarget_m = nullptr;
  double* footTargetVelocity_mps = nullptr;
  double* stiffness_N_per_m = nullptr;
  double* damping_Ns_per_m = nullptr;
  double* telemetry = nullptr;
};

inline std::size_t obsDoubles(int n) { return 20 + 11 * static_cast<std::size_t>(n); }
inline std::size_t actDoubles(int n, int t) { return 2 + 12 * static_cast<std::size_t>(n) + static_cast<std::size_t>(t); }

/** The frames are little-endian doubles; this client runs on little-endian machines (x86, ARM). */
inline void requireLittleEndian() {
  const std::uint16_t probe = 1;
  if (*reinterpret_cast<const unsigned char*>(&probe) != 1) throw std::runtime_error("footing_stdio.hpp: big-endian machines need a byte swap");
}

// ---- Reading stdin: straight from the descriptor (no stdio buffer that could hide bytes from
// poll()), spinning on a non-blocking read for a while before sleeping in poll().

/** FOOTING_SPIN_US from the environment: 0 (unset too) to 10000 µs. */
inline double spinFromEnvironment() {
  const char* text = std::getenv("FOOTING_SPIN_US");
  if (text == nullptr || *text == '\0') return 0.0;
  char* end = nullptr;
  const double value = std::strtod(text, &end);
  if (*end != '\0' || !(value >= 0.0 && value <= 10000.0)) throw std::runtime_error(std::string("FOOTING_SPIN_US = '") + text + "': expected microseconds from 0 (never spin) to 10000");
  return value;
}

/**
 * The harness's miss rule (harness/builds/process/spin.ts): in each block of 128 spins three may
 * miss; a fourth pauses the spin for 256, 512 … 4096 waits, a good block resets the pause.
 * A machine too busy to run both sides at once soon gets plain sleeping waits back.
 */
class SpinPacing {
 public:
  bool wanted() {
    if (skip_ > 0) {
      --skip_;
      return false;
    }
    return true;
  }
  void record(bool seen) {
    ++blockSpins_;
    if (!seen && ++blockMisses_ > 3) {
      ++pauses_;
      skip_ = 128 << std::min(pauses_, 5);
      blockSpins_ = blockMisses_ = 0;
    } else if (blockSpins_ == 128) {
      pauses_ = blockSpins_ = blockMisses_ = 0;
    }
  }

 private:
  int skip_ = 0;
  int blockSpins_ = 0;
  int blockMisses_ = 0;
  int pauses_ = 0;
};

class StdinReader {
 public:
  StdinReader(int fd, double spin_us) : fd_(fd), spin_(std::chrono::nanoseconds(static_cast<long long>(spin_us * 1000.0))) {
    if (spin_.count() > 0) {
      flags_ = ::fcntl(fd_, F_GETFL);
      if (flags_ == -1 || ::fcntl(fd_, F_SETFL, flags_ | O_NONBLOCK) == -1) spin_ = std::chrono::nanoseconds(0);
    }
  }
  // The descriptor may be shared with whoever started the program: its flags go back as they were.
  ~StdinReader() {
    if (spin_.count() > 0) ::fcntl(fd_, F_SETFL, flags_);
  }
  StdinReader(const StdinReader&) = delete;
  StdinReader& operator=(const StdinReader&) = delete;

  /** The next line without its newline (and a trailing \r); false at end of input. */
  bool readLine(std::string& line) {
    for (;;) {
      const std::size_t end = pending_.find('\n');
      if (end != std::string::npos) {
        line.assign(pending_, 0, end);
        pending_.erase(0, end + 1);
        if (!line.empty() && line.back() == '\r') line.pop_back();
        return true;
      }
      char chunk[4096];
      const long got = readSome(chunk, sizeof chunk);
      if (got <= 0) return false;
      pending_.append(chunk, static_cast<std::size_t>(got));
    }
  }

  /** Fills buffer[0, size); false at end of input (or a read error). */
  bool readExactly(unsigned char* buffer, std::size_t size) {
    std::size_t got = std::min(pending_.size(), size);
    if (got > 0) {
      std::memcpy(buffer, pending_.data(), got);
      pending_.erase(0, got);
    }
    while (got < size) {
      const long k = readSome(buffer + got, size - got);
      if (k <= 0) return false;
      got += static_cast<std::size_t>(k);
    }
    return true;
  }

 private:
  /** At least one byte; 0 at end of input, -1 on an error. */
  long readSome(void* buffer, std::size_t size) {
    if (spin_.count() > 0) {
      long got = tryRead(buffer, size);
      if (got != -2) return got;
      if (pacing_.wanted()) {
        const auto deadline = std::chrono::steady_clock::now() + spin_;
        bool seen = false;
        while (!seen && std::chrono::steady_clock::now() < deadline) {
          got = tryRead(buffer, size);
          seen = got != -2;
        }
        pacing_.record(seen);
        if (seen) return got;
      }
    }
    for (;;) {
      const long got = tryRead(buffer, size);
      if (got != -2) return got;
      // Nothing yet (the descriptor is non-blocking): sleep until there is.
      pollfd ready{fd_, POLLIN, 0};
      if (::poll(&ready, 1, -1) == -1 && errno != EINTR) return -1;
    }
  }

  /** read(2): bytes, 0 at end of input, -1 on an error, -2 when nothing is there yet. */
  long tryRead(void* buffer, std::size_t size) {
    for (;;) {
      const ssize_t got = ::read(fd_, buffer, size);
      if (got >= 0) return static_cast<long>(got);
      if (errno == EINTR) continue;
      return errno == EAGAIN || errno == EWOULDBLOCK ? -2 : -1;
    }
  }

  int fd_;
  std::chrono::nanoseconds spin_;
  int flags_ = 0;
  SpinPacing pacing_;
  std::string pending_;  // bytes read past the last line
};

inline Hello parseHello(const std::string& line) {
  Hello hello;
  hello.message = JsonReader(line).parse();
  const Json& m = hello.message;
  if (!m.has("type") || m["type"].text != "hello") throw std::runtime_error("expected a hello message first");
  if (m["protocol"].num() != PROTOCOL_VERSION) throw std::runtime_error("hello: protocol " + std::to_string(m["protocol"].num()) + ", this client speaks 1");
  hello.footCount = static_cast<int>(m["footCount"].num());
  hello.controlRate_Hz = m["controlRate_Hz"].num();
  hello.physicsStep_s = m["physicsStep_s"].num();
  for (int k = 0; k < 3; ++k) hello.gravity_mps2[k] = m["gravity_mps2"][static_cast<std::size_t>(k)].num();
  return hello;
}

inline Hello readHello(StdinReader& in) {
  std::string line;
  if (!in.readLine(line)) throw std::runtime_error("stdin ended before the hello");
  return parseHello(line);
}

inline std::string jsonString(const std::string& s) {
  std::string out = "\"";
  for (char c : s) {
    if (c == '"' || c == '\\') { out += '\\'; out += c; }
    else if (static_cast<unsigned char>(c) < 0x20) { char buf[8]; std::snprintf(buf, sizeof buf, "\\u%04x", c); out += buf; }
    else out += c;
  }
  return out + "\"";
}

/**
 * Serves one run: hello → Controller(hello) → ready (f64) → one act frame per obs frame until
 * bye or end of file. Returns the process exit code (0 on bye/EOF, 2 on a protocol problem,
 * with the reason on stderr).
 */
template <class Controller>
int run(const std::vector<std::string>& telemetryNames, const std::string& about, std::FILE* in = stdin, std::FILE* out = stdout) {
  try {
    requireLittleEndian();
    StdinReader reader(fileno(in), spinFromEnvironment());
    Hello hello = readHello(reader);
    if (!hello.offers("f64")) throw std::runtime_error("the hello does not offer the f64 encoding");
    Controller controller(hello);
    const int n = hello.footCount;
    const int t = static_cast<int>(telemetryNames.size());

    std::string ready = "{\"type\":\"ready\",\"protocol\":1,\"telemetryNames\":[";
    for (std::size_t i = 0; i < telemetryNames.size(); ++i) ready += (i ? "," : "") + jsonString(telemetryNames[i]);
    ready += "],\"encoding\":\"f64\",\"about\":" + jsonString(about) + "}\n";
    std::fwrite(ready.data(), 1, ready.size(), out);
    std::fflush(out);

    const std::size_t obsBytes = 8 + 8 * obsDoubles(n);
    const std::size_t actBytes = 8 + 8 * actDoubles(n, t);
    std::vector<unsigned char> obsFrame(obsBytes);
    std::vector<unsigned char> actFrame(actBytes);
    std::vector<double> o(obsDoubles(n));
    std::vector<double> a(actDoubles(n, t), 0.0);
    std::memcpy(actFrame.data(), "FOOTACT1", 8);

    Observation obs;
    const std::size_t un = static_cast<std::size_t>(n);
    obs.trunkPosition_m = &o[2];
    obs.trunkQuaternion = &o[5];
    obs.trunkVelocity_mps = &o[9];
    obs.trunkAngularVelocity_radps = &o[12];
    obs.footPosition_m = &o[15];
    obs.footVelocity_mps = &o[15 + 3 * un];
    obs.footForce_N = &o[15 + 6 * un];
    obs.footContact = &o[15 + 9 * un];
    obs.frictionEstimate = &o[15 + 10 * un];
    obs.commandVelocity_mps = &o[16 + 11 * un];
    Action act;
    act.mode = &a[2];
    act.groundForce_N = &a[2 + un];
    act.footTarget_m = &a[2 + 4 * un];
    act.footTargetVelocity_mps = &a[2 + 7 * un];
    act.stiffness_N_per_m = &a[2 + 10 * un];
    act.damping_Ns_per_m = &a[2 + 11 * un];
    act.telemetry = t > 0 ? &a[2 + 12 * un] : nullptr;

    for (;;) {
      if (!reader.readExactly(obsFrame.data(), obsBytes)) return 0;  // stdin closed
      if (std::memcmp(obsFrame.data(), "FOOTBYE1", 8) == 0) return 0;
      if (std::memcmp(obsFrame.data(), "FOOTOBS1", 8) != 0) throw std::runtime_error("bad frame tag");
      std::memcpy(o.data(), obsFrame.data() + 8, 8 * o.size());
      obs.tick = o[0];
      obs.time_s = o[1];
      obs.gait = o[15 + 11 * un];
      obs.commandYawRate_radps = o[19 + 11 * un];
      const auto start = std::chrono::steady_clock::now();
      controller.tick(obs, act);
      const auto took = std::chrono::steady_clock::now() - start;
      a[0] = obs.tick;
      a[1] = std::chrono::duration<double, std::micro>(took).count();
      std::memcpy(actFrame.data() + 8, a.data(), 8 * a.size());
      if (std::fwrite(actFrame.data(), 1, actBytes, out) != actBytes) return 0;  // harness gone
      std::fflush(out);
    }
  } catch (const std::exception& error) {
    std::fprintf(stderr, "%s: %s\n", about.c_str(), error.what());
    return 2;
  }
}

}  // namespace footing
