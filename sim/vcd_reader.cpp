#include "sim/vcd_reader.h"

#include <cctype>
#include <cerrno>
#include <cstring>
#include <utility>

namespace sim {

namespace {

constexpr std::size_t buffer_bytes = std::size_t{1} << 16;

bool is_space(char c) {
    return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v';
}

// A digit of a scalar or vector value, lower-cased, or 0 when `c` is none.
char value_digit(char c) {
    switch (c) {
        case '0':
        case '1':
            return c;
        case 'x':
        case 'X':
            return 'x';
        case 'z':
        case 'Z':
            return 'z';
        default:
            return 0;
    }
}

bool all_decimal(const std::string& s, std::size_t from) {
    if (s.size() <= from) return false;
    for (std::size_t i = from; i < s.size(); ++i)
        if (!std::isdigit(static_cast<unsigned char>(s[i]))) return false;
    return true;
}

// Decimal digits to an integer; false on overflow.
bool to_integer(const std::string& s, std::size_t from, std::uint64_t& out) {
    out = 0;
    for (std::size_t i = from; i < s.size(); ++i) {
        const auto d = static_cast<std::uint64_t>(s[i] - '0');
        if (out > (max_time_ps - d) / 10) return false;
        out = out * 10 + d;
    }
    return true;
}

}  // namespace

vcd_reader::vcd_reader(const std::string& path)
    : file_(std::make_unique<std::ifstream>(path, std::ios::binary)), source_(path) {
    if (!*file_)
        throw vcd_error(path + ": cannot read the file: " + std::strerror(errno) +
                        "; expected a VCD file (IEEE Std 1364-2005 clause 18)");
    in_ = file_.get();
    buffer_.resize(buffer_bytes);
    read_header();
}

vcd_reader::vcd_reader(std::istream& in, std::string source)
    : in_(&in), source_(std::move(source)) {
    buffer_.resize(buffer_bytes);
    read_header();
}

void vcd_reader::fail(const std::string& what) const {
    throw vcd_error(source_ + ":" + std::to_string(token_line_) + ": " + what);
}

bool vcd_reader::read_token() {
    token_.clear();
    for (;;) {
        if (buffer_pos_ == buffer_end_) {
            if (!*in_) break;
            in_->read(buffer_.data(), static_cast<std::streamsize>(buffer_.size()));
            buffer_end_ = static_cast<std::size_t>(in_->gcount());
            buffer_pos_ = 0;
            if (buffer_end_ == 0) break;
        }
        const char c = buffer_[buffer_pos_++];
        if (is_space(c)) {
            if (!token_.empty()) {
                // The new line belongs to the next token.
                if (c == '\n') --buffer_pos_;
                return true;
            }
            if (c == '\n') ++line_;
            continue;
        }
        if (token_.empty()) token_line_ = line_;
        token_ += c;
    }
    if (in_->bad()) throw vcd_error(source_ + ": the file could not be read to its end");
    // At the end of the file token_line_ stays the last token's line, where messages point.
    return !token_.empty();
}

const std::string& vcd_reader::expect_token(const char* what) {
    if (!read_token()) fail(std::string("the file ends where ") + what + " was expected");
    return token_;
}

void vcd_reader::skip_section(const std::string& keyword) {
    const std::uint64_t from = token_line_;
    while (read_token())
        if (token_ == "$end") return;
    token_line_ = from;
    fail(keyword + " has no $end; every section ends with $end");
}

void vcd_reader::read_timescale() {
    std::string spec;
    for (;;) {
        const std::string& t = expect_token("$end after the timescale");
        if (t == "$end") break;
        spec += t;
    }
    std::size_t digits = 0;
    while (digits < spec.size() && std::isdigit(static_cast<unsigned char>(spec[digits]))) ++digits;
    const std::string number = spec.substr(0, digits);
    const std::string unit = spec.substr(digits);
    const std::pair<const char*, time_ps> units[] = {
        {"s", ps_per_second}, {"ms", 1'000'000'000}, {"us", 1'000'000}, {"ns", 1'000}, {"ps", 1}};
    time_ps scale = 0;
    for (const auto& [name, ps] : units)
        if (unit == name) scale = ps;
    if ((number != "1" && number != "10" && number != "100") || (scale == 0 && unit != "fs"))
        fail("timescale \"" + spec + "\": expected 1, 10 or 100 and a unit s, ms, us, ns or ps");
    if (scale == 0)
        fail("timescale \"" + spec +
             "\" is finer than 1 ps: tickbench keeps times in whole picoseconds; expected a unit "
             "of s, ms, us, ns or ps");
    unit_ps_ = std::stoull(number) * scale;
}

void vcd_reader::read_var() {
    vcd_variable v;
    v.type = expect_token("the variable's type");
    const std::string size = expect_token("the variable's size");
    std::uint64_t width = 0;
    if (!all_decimal(size, 0) || !to_integer(size, 0, width) || width == 0 || width > 1'000'000)
        fail("variable size \"" + size + "\": expected a whole number of bits from 1");
    v.width = static_cast<std::uint32_t>(width);
    v.code = expect_token("the variable's identifier code");
    if (v.code == "$end")
        fail("the variable has no identifier code; expected $var TYPE SIZE CODE NAME $end");
    const std::string reference = expect_token("the variable's name");
    if (reference == "$end")
        fail("the variable has no name; expected $var TYPE SIZE CODE NAME $end");
    for (const std::string& s : scopes_) v.name += s + ".";
    v.name += reference;
    for (;;) {
        const std::string& t = expect_token("$end after the variable");
        if (t == "$end") break;
        v.name += t;  // a bit select or range, kept with the name
    }
    by_code_[v.code].push_back(variables_.size());
    variables_.push_back(std::move(v));
}

void vcd_reader::read_header() {
    for (;;) {
        if (!read_token())
            fail(
                "the file ends before $enddefinitions; expected a VCD header (IEEE Std 1364-2005 "
                "clause 18)");
        const std::string keyword = token_;
        if (keyword == "$date" || keyword == "$version" || keyword == "$comment") {
            skip_section(keyword);
        } else if (keyword == "$timescale") {
            read_timescale();
        } else if (keyword == "$scope") {
            expect_token("the scope's type");
            const std::string name = expect_token("the scope's name");
            if (name == "$end") fail("the scope has no name; expected $scope TYPE NAME $end");
            scopes_.push_back(name);
            if (expect_token("$end") != "$end") fail("expected $end after the scope's name");
        } else if (keyword == "$upscope") {
            if (scopes_.empty()) fail("$upscope outside every scope");
            scopes_.pop_back();
            if (expect_token("$end") != "$end") fail("expected $end after $upscope");
        } else if (keyword == "$var") {
            read_var();
        } else if (keyword == "$enddefinitions") {
            if (expect_token("$end") != "$end") fail("expected $end after $enddefinitions");
            break;
        } else {
            fail("\"" + keyword +
                 "\" in the header; expected $date, $version, $comment, $timescale, $scope, "
                 "$upscope, $var or $enddefinitions");
        }
    }
    if (unit_ps_ == 0)
        fail("the header has no $timescale; expected one such as $timescale 1 ps $end");
}

std::string vcd_reader::extend(const std::string& digits, std::uint32_t width) {
    if (digits.size() >= width) return digits;
    const char fill = digits.empty() || digits[0] == '1' ? '0' : digits[0];
    return std::string(width - digits.size(), fill) + digits;
}

void vcd_reader::queue_change(const std::string& code, const std::string& digits, char kind) {
    const auto found = by_code_.find(code);
    if (found == by_code_.end())
        fail("a value change of identifier code \"" + code + "\", which no $var declares");
    for (const std::size_t index : found->second) {
        const vcd_variable& v = variables_[index];
        vcd_change c;
        c.at = now_;
        c.variable = index;
        if (kind == 'r') {
            c.value = digits;
        } else {
            if (digits.size() > v.width)
                fail("a value of " + std::to_string(digits.size()) + " bits for \"" + v.name +
                     "\", declared with " + std::to_string(v.width));
            c.value = extend(digits, v.width);
        }
        pending_.push_back(std::move(c));
    }
}

bool vcd_reader::next(vcd_change& change) {
    while (pending_.empty()) {
        if (finished_) return false;
        if (!read_token()) {
            finished_ = true;
            return false;
        }
        const std::string& t = token_;
        if (t[0] == '#') {
            std::uint64_t units = 0;
            if (!all_decimal(t, 1) || !to_integer(t, 1, units))
                fail("\"" + t + "\": expected a time, # and a whole number");
            if (units > max_time_ps / unit_ps_)
                fail("time \"" + t + "\" lies beyond the 64-bit picosecond range");
            const time_ps at = units * unit_ps_;
            if (seen_time_ && at < now_)
                fail("time \"" + t + "\" goes back from " + format_time(now_) +
                     "; expected times in non-decreasing order");
            now_ = at;
            seen_time_ = true;
        } else if (t == "$dumpvars" || t == "$dumpall" || t == "$dumpon" || t == "$dumpoff" ||
                   t == "$end") {
            // The sections' values are changes at the current time like any other.
        } else if (t == "$comment") {
            skip_section(t);
        } else if (t[0] == 'b' || t[0] == 'B') {
            std::string digits;
            for (std::size_t i = 1; i < t.size(); ++i) {
                const char d = value_digit(t[i]);
                if (d == 0) fail("vector value \"" + t + "\": expected b and digits 0, 1, x or z");
                digits += d;
            }
            if (digits.empty())
                fail("vector value \"b\" has no digits; expected digits 0, 1, x or z");
            queue_change(expect_token("the identifier code after a vector value"), digits, 'b');
        } else if (t[0] == 'r' || t[0] == 'R') {
            if (t.size() == 1) fail("real value \"r\" has no number");
            const std::string value = t.substr(1);
            queue_change(expect_token("the identifier code after a real value"), value, 'r');
        } else if (value_digit(t[0]) != 0) {
            if (t.size() == 1) fail("scalar value \"" + t + "\" has no identifier code");
            queue_change(t.substr(1), std::string(1, value_digit(t[0])), 's');
        } else {
            fail("\"" + t +
                 "\": expected a time (#N), a value change (0!, b0101 !, r1.5 !), or $dumpvars, "
                 "$dumpall, $dumpon, $dumpoff, $comment, $end");
        }
    }
    change = std::move(pending_.front());
    pending_.pop_front();
    return true;
}

}  // namespace sim
