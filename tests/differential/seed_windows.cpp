#include "tests/differential/seed_windows.h"

#include <cctype>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <sstream>
#include <stdexcept>

namespace tickbench::differential {

namespace {

constexpr const char* programs_variable = "TICKBENCH_DIFF_PROGRAMS";
constexpr const char* first_seed_variable = "TICKBENCH_DIFF_FIRST_SEED";
constexpr const char* rotating_variable = "TICKBENCH_DIFF_ROTATING_SEED";

std::optional<std::string> env(const char* name) {
    const char* v = std::getenv(name);
    if (!v || !*v) return std::nullopt;
    return std::string(v);
}

// A whole decimal number, or an error naming the variable and what it accepts.
std::uint64_t whole_number(const char* name, const std::string& text, const char* accepted) {
    std::size_t digits = 0;
    while (digits < text.size() && std::isdigit(static_cast<unsigned char>(text[digits]))) ++digits;
    if (digits == 0 || digits != text.size() || digits > 19)
        throw std::invalid_argument(std::string(name) + "=" + text + ": not a whole number; " +
                                    accepted);
    return std::strtoull(text.c_str(), nullptr, 10);
}

// Single-quoted for a POSIX shell, unless plain.
std::string shell_quoted(const std::string& s) {
    bool plain = !s.empty();
    for (char c : s)
        if (!std::isalnum(static_cast<unsigned char>(c)) &&
            std::string("/._-+=:,").find(c) == std::string::npos)
            plain = false;
    if (plain) return s;
    std::string out = "'";
    for (char c : s) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
    return out + "'";
}

// The commit checked out in dir (40 or 64 hex digits), if git can say.
std::optional<std::string> head_commit(const std::string& dir) {
    const std::string command = "git -C " + shell_quoted(dir) + " rev-parse HEAD 2>/dev/null";
    FILE* pipe = popen(command.c_str(), "r");
    if (!pipe) return std::nullopt;
    std::string out;
    char buf[128];
    while (std::fgets(buf, sizeof buf, pipe)) out += buf;
    const int status = pclose(pipe);
    while (!out.empty() && std::isspace(static_cast<unsigned char>(out.back()))) out.pop_back();
    if (status != 0 || (out.size() != 40 && out.size() != 64)) return std::nullopt;
    for (char c : out)
        if (!std::isxdigit(static_cast<unsigned char>(c))) return std::nullopt;
    return out;
}

std::string utc_date_today() {
    const std::time_t now = std::time(nullptr);
    std::tm utc{};
    gmtime_r(&now, &utc);
    char buf[16];
    std::strftime(buf, sizeof buf, "%Y-%m-%d", &utc);
    return buf;
}

}  // namespace

std::uint64_t programs_per_window(std::uint64_t default_count) {
    const auto v = env(programs_variable);
    return v ? whole_number(programs_variable, *v, "accepted: a number of programs, e.g. 20000")
             : default_count;
}

seed_window fixed_window(std::uint64_t default_count) {
    seed_window w;
    w.count = programs_per_window(default_count);
    if (const auto v = env(first_seed_variable)) {
        w.first = whole_number(first_seed_variable, *v, "accepted: a seed, e.g. 1");
        w.origin = std::string(first_seed_variable);
    } else {
        w.origin = "fixed";
    }
    return w;
}

std::optional<seed_window> rotating_window(std::uint64_t default_count,
                                           const std::string& source_dir) {
    seed_window w;
    w.count = programs_per_window(default_count);
    if (const auto v = env(rotating_variable)) {
        if (*v == "off") return std::nullopt;
        w.first = whole_number(rotating_variable, *v, "accepted: a seed, e.g. 7301000, or off");
        w.origin = std::string(rotating_variable);
    } else if (const auto commit = head_commit(source_dir)) {
        w.first = rotating_first_seed(*commit);
        w.origin = "from commit " + *commit;
    } else {
        const std::string date = utc_date_today();
        w.first = rotating_first_seed(date);
        w.origin = "from the UTC date " + date + "; git knows no commit in " + source_dir;
    }
    return w;
}

std::uint64_t rotating_first_seed(const std::string& text) {
    // FNV-1a, 64 bits: any small change of the text moves the window far.
    std::uint64_t h = 0xcbf29ce484222325ULL;
    for (unsigned char c : text) {
        h ^= c;
        h *= 0x100000001b3ULL;
    }
    return 1'000'000 + (h % 999'000) * 1000;
}

std::vector<std::uint64_t> shard_seeds(const seed_window& w, unsigned shard, unsigned shard_count) {
    std::vector<std::uint64_t> seeds;
    for (std::uint64_t i = shard; i < w.count; i += shard_count) seeds.push_back(w.first + i);
    return seeds;
}

std::string rerun_command(std::uint64_t seed, const std::string& program,
                          const std::string& fixed_shard_test) {
    std::ostringstream s;
    s << first_seed_variable << "=" << seed << " " << programs_variable << "=1 "
      << rotating_variable << "=off " << shell_quoted(program) << " "
      << shell_quoted("--gtest_filter=" + fixed_shard_test + "/0");
    return s.str();
}

std::string describe(const seed_window& w) {
    std::ostringstream s;
    if (w.count == 0)
        s << "no seeds";
    else
        s << w.first << ".." << w.first + w.count - 1;
    s << " (" << w.origin << ")";
    return s.str();
}

}  // namespace tickbench::differential
