#include "sim/vcd_writer.h"

#include <spdlog/spdlog.h>

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <ctime>
#include <system_error>
#include <utility>

namespace sim {

namespace {

constexpr time_ps largest_unit_ps = 100 * ps_per_second;  // "100 s"
constexpr std::size_t min_buffer_bytes = 4096;
// Room a time line needs: '#', 20 digits, '\n', and the fixed-size copies' padding.
constexpr std::size_t max_time_line = 32;

// 10^k ps -> k, or -1 when `u` is not a power of ten within the timescale's range.
int decade_of(time_ps u) {
    int k = 0;
    for (time_ps p = 1; p <= largest_unit_ps; p *= 10, ++k)
        if (p == u) return k;
    return -1;
}

// A VCD name holds no white space or control characters (clause 18: identifiers and references
// are white-space delimited tokens).
std::string clean_name(const std::string& s) {
    std::string out = s.empty() ? std::string("_") : s;
    for (char& c : out) {
        const auto u = static_cast<unsigned char>(c);
        if (u <= 32 || u >= 127) c = '_';
    }
    return out;
}

std::vector<std::string> split_scope(const std::string& scope) {
    std::vector<std::string> parts;
    std::size_t from = 0;
    while (from <= scope.size()) {
        const std::size_t dot = std::min(scope.find('.', from), scope.size());
        if (dot > from) parts.push_back(clean_name(scope.substr(from, dot - from)));
        from = dot + 1;
    }
    // Variables outside every scope are not in the clause's grammar as recalled: give them one.
    if (parts.empty()) parts.emplace_back("top");
    return parts;
}

std::string utc_now() {
    const std::time_t now = std::time(nullptr);
    std::tm tm{};
    gmtime_r(&now, &tm);
    char text[64];
    const std::size_t n = std::strftime(text, sizeof text, "%Y-%m-%d %H:%M:%S UTC", &tm);
    return std::string(text, n);
}

}  // namespace

vcd_writer::vcd_writer(std::string path, vcd_options options)
    : path_(std::move(path)), options_(std::move(options)), unit_(options_.unit_ps) {
    if (decade_of(unit_) < 0)
        throw std::invalid_argument(
            "vcd_writer: timescale unit of " + std::to_string(unit_) +
            " ps: expected 1, 10 or 100 times ps, ns, us, ms or s (10^0 to 10^14 ps)");
    if (options_.buffer_bytes < min_buffer_bytes)
        throw std::invalid_argument(
            "vcd_writer: buffer of " + std::to_string(options_.buffer_bytes) +
            " bytes: expected at least " + std::to_string(min_buffer_bytes));
    capacity_ = options_.buffer_bytes;
    buffer_.reset(new char[capacity_]);  // not zeroed: every byte is written before it is read
    errno = 0;
    file_ = std::fopen(path_.c_str(), "wb");
    if (file_ == nullptr) fail("cannot open", errno);
    // Our own buffers are the only ones: each hand-over is one write to the file.
    std::setvbuf(file_, nullptr, _IONBF, 0);
}

vcd_writer::~vcd_writer() {
    if (!ended_) {
        try {
            end(last_time_ * unit_);
        } catch (const std::exception& e) {
            spdlog::error("waveform: {}", e.what());
        }
    }
    stop_worker();
    if (file_ != nullptr) std::fclose(file_);
}

std::string vcd_writer::timescale_text(time_ps unit_ps) {
    const int k = decade_of(unit_ps);
    if (k < 0)
        throw std::invalid_argument("timescale unit of " + std::to_string(unit_ps) +
                                    " ps: expected 1, 10 or 100 times ps, ns, us, ms or s");
    static const char* const numbers[] = {"1", "10", "100"};
    static const char* const units[] = {"ps", "ns", "us", "ms", "s"};
    return std::string(numbers[k % 3]) + " " + units[k / 3];
}

time_ps vcd_writer::coarsest_exact_unit(const std::vector<time_ps>& times, time_ps limit_ps) {
    time_ps best = 1;
    while (best * 10 <= std::min(limit_ps, largest_unit_ps)) best *= 10;
    for (const time_ps t : times)
        while (best > 1 && t % best != 0) best /= 10;
    return best;
}

std::string vcd_writer::identifier_code(signal_id id) {
    // Bijective base 94 over '!'..'~': every string of those characters is the code of one id,
    // so codes stay as short as they can be.
    std::string code;
    std::uint64_t v = id;
    for (;;) {
        code += static_cast<char>(33 + v % 94);
        v /= 94;
        if (v == 0) break;
        --v;
    }
    return code;
}

void vcd_writer::declare(signal_id id, const signal_info& info) {
    if (begun_) throw std::logic_error("vcd_writer: declare() after begin()");
    if (id != signals_.size())
        throw std::logic_error("vcd_writer: signal " + std::to_string(id) +
                               " declared out of order, expected " +
                               std::to_string(signals_.size()));
    signal s;
    s.level = info.initial;
    const std::string code = identifier_code(id) + '\n';  // at most 5 + 1 characters for 32-bit ids
    std::memcpy(s.code, code.data(), code.size());
    s.code_length = static_cast<std::uint8_t>(code.size());
    infos_.push_back({info.scope, clean_name(info.name), info.initial});
    signals_.push_back(std::move(s));
}

void vcd_writer::begin() {
    if (begun_) throw std::logic_error("vcd_writer: begin() called twice");
    begun_ = true;
    write_header();
    step_start_ = used_;
    append("#0\n$dumpvars\n", 13);
    for (const signal& s : signals_) {
        reserve(1 + s.code_length);
        buffer_[used_++] = s.level ? '1' : '0';
        append(s.code, s.code_length);
    }
    append("$end\n", 5);
    last_time_ = 0;
}

void vcd_writer::write_header() {
    append("$date\n\t");
    append(options_.date.empty() ? utc_now() : options_.date);
    append("\n$end\n$version\n\t");
    append(options_.version);
    append("\n$end\n$timescale\n\t");
    append(timescale_text(unit_));
    append("\n$end\n");
    if (unit_ > 1) {
        append(
            "$comment\n\tkernel times are exact picoseconds; a time between two units is written "
            "at the nearest one\n$end\n");
    }

    // The scope tree, children in order of first appearance, variables in id order.
    struct node {
        std::string name;
        std::vector<std::size_t> children;
        std::vector<signal_id> vars;
    };
    std::vector<node> nodes(1);  // nodes[0]: the root, not written
    for (signal_id id = 0; id < signals_.size(); ++id) {
        std::size_t at = 0;
        for (const std::string& part : split_scope(infos_[id].scope)) {
            std::size_t next = nodes.size();
            for (const std::size_t c : nodes[at].children)
                if (nodes[c].name == part) next = c;
            if (next == nodes.size()) {
                nodes.push_back({part, {}, {}});
                nodes[at].children.push_back(next);
            }
            at = next;
        }
        nodes[at].vars.push_back(id);
    }
    // Depth-first, without recursion: (node, children visited) pairs.
    std::vector<std::pair<std::size_t, std::size_t>> stack;
    for (const std::size_t top : nodes[0].children) {
        stack.emplace_back(top, 0);
        while (!stack.empty()) {
            auto& [n, visited] = stack.back();
            if (visited == 0) {
                append("$scope module ");
                append(nodes[n].name);
                append(" $end\n");
                for (const signal_id id : nodes[n].vars) {
                    const signal& s = signals_[id];
                    append("$var wire 1 ");
                    append(s.code, s.code_length - 1);
                    append(" ");
                    append(infos_[id].name);
                    append(" $end\n");
                }
            }
            if (visited < nodes[n].children.size()) {
                const std::size_t child = nodes[n].children[visited++];
                stack.emplace_back(child, 0);
            } else {
                append("$upscope $end\n");
                stack.pop_back();
            }
        }
    }
    append("$enddefinitions $end\n");
}

void vcd_writer::change(signal_id id, bool level, time_ps at) {
    // The common path stays small; everything rare (errors, rounding) is out of line.
    if (id >= signals_.size() || !begun_ || ended_ || at > options_.end_ps) refuse_change(id, at);
    signal& s = signals_[id];
    if (s.level == level) return;
    const std::uint64_t t = unit_ == 1 ? at : to_units(at);
    if (t != last_time_) {
        if (t < last_time_) refuse_change(id, at);
        reserve(max_time_line + 1 + sizeof s.code);
        append_time(t);
    } else {
        reserve(1 + sizeof s.code);
    }
    // A fixed-size copy of the padded code is one move; only code_length bytes of it count.
    char* out = buffer_.get() + used_;
    *out = level ? '1' : '0';
    std::memcpy(out + 1, s.code, sizeof s.code);
    used_ += 1 + s.code_length;
    s.level = level;
    ++written_;
}

void vcd_writer::refuse_change(signal_id id, time_ps at) const {
    if (id >= signals_.size())
        throw std::logic_error("vcd_writer: change of undeclared signal " + std::to_string(id));
    if (!begun_ || ended_) throw std::logic_error("vcd_writer: change outside begin()..end()");
    if (at > options_.end_ps)
        throw std::logic_error("vcd_writer: change at " + format_time(at) +
                               " after the run's end " + format_time(options_.end_ps));
    throw std::logic_error("vcd_writer: change at " + format_time(at) + " after a change at " +
                           format_time(last_time_ * unit_));
}

std::uint64_t vcd_writer::to_units(time_ps at) {
    std::uint64_t t = at / unit_;
    const time_ps rem = at % unit_;
    if (rem != 0) {
        ++rounded_;
        if (2 * rem >= unit_ && t < options_.end_ps / unit_) ++t;
    }
    return t;
}

void vcd_writer::end(time_ps at) {
    if (ended_) return;
    if (!begun_) begin();
    ended_ = true;
    // The final time marks how long the run lasted, so viewers show the last levels to the end;
    // rounded down, so that it never lies after the run.
    const std::uint64_t t = std::min(at, options_.end_ps) / unit_;
    if (t > last_time_) {
        reserve(max_time_line);
        append_time(t);
    }
    write_out(used_);
    drain();
    stop_worker();
    close_file();
}

namespace {

constexpr char digit_pairs[] =
    "00010203040506070809101112131415161718192021222324252627282930313233343536373839"
    "40414243444546474849505152535455565758596061626364656667686970717273747576777879"
    "8081828384858687888990919293949596979899";

// Writes the decimal digits of v ending just before `end`, two per division; returns the first.
char* format_backwards(std::uint64_t v, char* end) {
    while (v >= 100) {
        const auto r = static_cast<std::size_t>(v % 100);
        v /= 100;
        end -= 2;
        std::memcpy(end, digit_pairs + 2 * r, 2);
    }
    if (v >= 10) {
        end -= 2;
        std::memcpy(end, digit_pairs + 2 * v, 2);
    } else {
        *--end = static_cast<char>('0' + v);
    }
    return end;
}

#if !defined(__BYTE_ORDER__) || __BYTE_ORDER__ != __ORDER_LITTLE_ENDIAN__
#error "eight_digits() lays digits out for a little-endian host"
#endif

// The 8 ASCII digits of v < 10^8, most significant first, as the bytes of a little-endian word:
// the two 4-digit halves, then their 2-digit halves, then single digits, each split done in all
// lanes of one 64-bit word at once by a multiply and a shift (x * 10486 >> 20 is x / 100 and
// x * 103 >> 10 is x / 10 for the ranges that occur). Checked against printf for every v by hand
// once; tests/waves compares the times the writer prints.
std::uint64_t eight_digits(std::uint32_t v) {
    const std::uint64_t merged = (v / 10000) | (std::uint64_t{v % 10000} << 32);
    const std::uint64_t top = ((merged * 10486) >> 20) & ((std::uint64_t{0x7f} << 32) | 0x7f);
    const std::uint64_t bottom = merged - 100 * top;
    const std::uint64_t hundreds = (bottom << 16) + top;
    std::uint64_t tens = (hundreds * 103) >> 10;
    tens &= (std::uint64_t{0xf} << 48) | (std::uint64_t{0xf} << 32) | (std::uint64_t{0xf} << 16) |
            std::uint64_t{0xf};
    tens += (hundreds - 10 * tens) << 8;
    return tens + 0x3030'3030'3030'3030ULL;
}

// Number of decimal digits of 0 < v < 10^8.
unsigned digits_below_10_8(std::uint32_t v) {
    return v < 10'000 ? (v < 100 ? (v < 10 ? 1 : 2) : (v < 1'000 ? 3 : 4))
                      : (v < 1'000'000 ? (v < 100'000 ? 5 : 6) : (v < 10'000'000 ? 7 : 8));
}

}  // namespace

void vcd_writer::append_time(std::uint64_t t) {
    // Time lines are most of the formatting work. The digits above the last eight change rarely
    // (every 100 us at 1 ps), so they are kept formatted; the low eight are formatted each time.
    // Fixed-size copies (padding is overwritten or lies past used_) avoid variable-length calls.
    constexpr std::uint64_t low_limit = 100'000'000;
    step_start_ = used_;
    char* out = buffer_.get() + used_;
    out[0] = '#';
    std::size_t n = 0;
    if (t < low_limit) {
        const auto v = static_cast<std::uint32_t>(t);
        const std::uint64_t word = eight_digits(v);
        char digits[16] = {};
        std::memcpy(digits, &word, 8);
        n = v == 0 ? 1 : digits_below_10_8(v);
        std::memcpy(out + 1, digits + 8 - n, 8);
    } else {
        const std::uint64_t high = t / low_limit;
        if (high != high_value_ || high_length_ == 0) {
            char digits[16];
            const char* first = format_backwards(high, digits + 16);
            high_length_ = static_cast<std::uint32_t>(digits + 16 - first);
            std::memcpy(high_digits_, first, high_length_);
            high_value_ = high;
        }
        std::memcpy(out + 1, high_digits_, sizeof high_digits_);
        const std::uint64_t low = eight_digits(static_cast<std::uint32_t>(t - high * low_limit));
        std::memcpy(out + 1 + high_length_, &low, 8);
        n = high_length_ + 8;
    }
    out[n + 1] = '\n';
    used_ += n + 2;
    last_time_ = t;
}

void vcd_writer::append(const char* s, std::size_t n) {
    // Header pieces may be longer than the buffer (a long $date text): write them in parts.
    while (n > 0) {
        reserve(std::min(n, capacity_));
        const std::size_t k = std::min(n, capacity_ - used_);
        std::memcpy(buffer_.get() + used_, s, k);
        used_ += k;
        s += k;
        n -= k;
    }
}

void vcd_writer::make_room(std::size_t n) {
    // Write the complete time steps and keep the current one, so the file ends on a step boundary.
    if (step_start_ > 0) write_out(step_start_);
    // One time step longer than the buffer: write it as it is, it ends on a line boundary at least.
    if (used_ + n > capacity_) write_out(used_);
}

void vcd_writer::write_out(std::size_t n) {
    if (n == 0) return;
    if (file_ == nullptr) throw std::logic_error("vcd_writer: write after the file was closed");
    // Without a thread, or for the last write of a file that never filled a buffer, write here.
    if (!options_.writer_thread || (ended_ && !worker_.joinable())) {
        errno = 0;
        if (std::fwrite(buffer_.get(), 1, n, file_) != n)
            abandon("cannot write", errno != 0 ? errno : EIO);
        std::memmove(buffer_.get(), buffer_.get() + n, used_ - n);
        used_ -= n;
        step_start_ = step_start_ >= n ? step_start_ - n : 0;
        return;
    }
    if (!worker_.joinable()) {
        spare_.reset(new char[capacity_]);
        worker_ = std::thread([this] { run_worker(); });
    }
    {
        std::unique_lock<std::mutex> lock(mutex_);
        idle_.wait(lock, [this] { return !work_ready_; });
        if (worker_error_ != 0) {
            lock.unlock();
            abandon("cannot write", worker_error_);
        }
        // The worker writes the full buffer; filling goes on in the spare one.
        std::swap(buffer_, spare_);
        work_bytes_ = n;
        work_ready_ = true;
    }
    work_.notify_one();
    // Both threads only read the handed-over buffer: copying its tail needs no lock.
    std::memcpy(buffer_.get(), spare_.get() + n, used_ - n);
    used_ -= n;
    step_start_ = step_start_ >= n ? step_start_ - n : 0;
}

void vcd_writer::drain() {
    if (!worker_.joinable()) return;
    std::unique_lock<std::mutex> lock(mutex_);
    idle_.wait(lock, [this] { return !work_ready_; });
    if (worker_error_ != 0) {
        lock.unlock();
        abandon("cannot write", worker_error_);
    }
}

void vcd_writer::stop_worker() {
    if (!worker_.joinable()) return;
    {
        std::lock_guard<std::mutex> lock(mutex_);
        stopping_ = true;
    }
    work_.notify_one();
    worker_.join();
}

void vcd_writer::run_worker() {
    std::unique_lock<std::mutex> lock(mutex_);
    for (;;) {
        work_.wait(lock, [this] { return work_ready_ || stopping_; });
        if (!work_ready_) return;  // stopping, nothing left
        const char* data = spare_.get();
        const std::size_t n = work_bytes_;
        const bool failed_before = worker_error_ != 0;
        lock.unlock();
        int err = 0;
        if (!failed_before) {
            errno = 0;
            if (std::fwrite(data, 1, n, file_) != n) err = errno != 0 ? errno : EIO;
        }
        lock.lock();
        if (err != 0) worker_error_ = err;
        work_ready_ = false;
        idle_.notify_all();
    }
}

void vcd_writer::flush() {
    if (ended_ || file_ == nullptr) return;
    write_out(step_start_);
    drain();
}

void vcd_writer::abandon(const char* what, int err) {
    stop_worker();
    if (file_ != nullptr) std::fclose(std::exchange(file_, nullptr));
    ended_ = true;
    fail(what, err);
}

void vcd_writer::close_file() {
    std::FILE* f = std::exchange(file_, nullptr);
    errno = 0;
    if (std::fclose(f) != 0) fail("cannot close", errno != 0 ? errno : EIO);
}

void vcd_writer::fail(const char* what, int err) {
    throw output_error(std::string(what) + " waveform file '" + path_ +
                       "': " + std::error_code(err, std::generic_category()).message());
}

}  // namespace sim
