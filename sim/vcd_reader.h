#pragma once
// A streaming reader of value change dump (VCD) files, the counterpart of sim::vcd_writer: it reads
// the header (timescale, scopes, variables) when it is made, then hands out one value change at a
// time, so a file of any length is read in constant memory. `tickbench compare` reads two runs'
// waveforms side by side with it.
//
// It follows IEEE Std 1364-2005, clause 18 (recalled from memory, not checked against the text):
// header sections $date, $version, $comment (skipped), $timescale ("1 ps", "10ns", "100 us"),
// $scope TYPE NAME $end / $upscope $end, $var TYPE SIZE CODE REFERENCE [RANGE] $end,
// $enddefinitions $end; then "#TIME" lines in non-decreasing time, scalar changes ("1!"), vector
// changes ("b1010 !"), real changes ("r2.5 !"), and $dumpvars, $dumpall, $dumpon, $dumpoff
// sections whose values count as changes at the current time. Several variables may share one
// identifier code; a change of the code is a change of each of them.
//
// Values come out normalised, so that two writers' spellings of one value compare equal: x and z
// in lower case, and a vector value shorter than its variable extended on the left as the clause
// says (with 0 when its leftmost digit is 0 or 1, with x or z when it is x or z). A real keeps its
// text. Times come out in exact picoseconds: a timescale finer than 1 ps is refused.
//
// Anything the reader does not understand is a vcd_error naming the file and line and saying what
// was expected there.

#include "sim/clock_domain.h"

#include <cstdint>
#include <deque>
#include <fstream>
#include <istream>
#include <memory>
#include <stdexcept>
#include <string>
#include <unordered_map>
#include <vector>

namespace sim {

// A VCD file that cannot be read, or that breaks the format: "file:line: what was wrong; what was
// expected".
class vcd_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

// One $var of the header.
struct vcd_variable {
    std::string
        name;  // scopes and reference joined with '.', a bit range appended ("top.bus[3:0]")
    std::string type;  // as declared: wire, reg, real, ...
    std::uint32_t width = 1;
    std::string code;  // identifier code
};

// One value change of one variable.
struct vcd_change {
    time_ps at = 0;
    std::size_t variable = 0;  // index into vcd_reader::variables()
    std::string value;         // normalised: "0", "1", "x", "z", "0101", or a real's text
};

class vcd_reader {
public:
    // Opens the file at `path` and reads its header through $enddefinitions; throws vcd_error when
    // the file cannot be read or the header is malformed.
    explicit vcd_reader(const std::string& path);
    // Reads VCD text from `in`, calling it `source` in messages; `in` must outlive the reader.
    vcd_reader(std::istream& in, std::string source);
    vcd_reader(const vcd_reader&) = delete;
    vcd_reader& operator=(const vcd_reader&) = delete;

    // The file's name as messages give it.
    const std::string& source() const { return source_; }
    // The timescale unit in picoseconds.
    time_ps unit_ps() const { return unit_ps_; }
    // Every variable of the header, in declaration order.
    const std::vector<vcd_variable>& variables() const { return variables_; }
    // Reads the next value change in file order into `change`; returns false at the end of the
    // file. Throws vcd_error on malformed text.
    bool next(vcd_change& change);
    // The time of the last "#TIME" read, in picoseconds (0 before the first).
    time_ps time() const { return now_; }
    // True once next() has returned false.
    bool finished() const { return finished_; }
    // `digits` (0, 1, x, z, lower case) extended on the left to `width` digits as the clause
    // says; a value already as wide is returned as it is.
    static std::string extend(const std::string& digits, std::uint32_t width);

private:
    // Reads the next white-space delimited token into token_ (and its line into token_line_);
    // returns false at the end of the input.
    bool read_token();
    // The next token, which must exist; `what` says what was expected, for the error.
    const std::string& expect_token(const char* what);
    // Skips tokens through the next "$end".
    void skip_section(const std::string& keyword);
    void read_header();
    void read_timescale();
    void read_var();
    // Queues the changes that `value` (normalised for each variable) makes to the variables of
    // `code`.
    void queue_change(const std::string& code, const std::string& digits, char kind);
    [[noreturn]] void fail(const std::string& what) const;

    std::unique_ptr<std::ifstream> file_;
    std::istream* in_ = nullptr;
    std::string source_;
    std::vector<char> buffer_;
    std::size_t buffer_pos_ = 0;
    std::size_t buffer_end_ = 0;
    std::uint64_t line_ = 1;  // line of the next character
    std::string token_;
    std::uint64_t token_line_ = 0;

    time_ps unit_ps_ = 0;
    std::vector<vcd_variable> variables_;
    std::unordered_map<std::string, std::vector<std::size_t>> by_code_;
    std::vector<std::string> scopes_;
    time_ps now_ = 0;
    bool seen_time_ = false;
    std::deque<vcd_change> pending_;  // changes of a shared code not handed out yet
    bool finished_ = false;
};

}  // namespace sim
