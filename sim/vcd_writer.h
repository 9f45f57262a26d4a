#pragma once
// The waveform writer: a signal_sink that streams a four-state value change dump (VCD) file.
//
// The format is the one of IEEE Std 1364-2005, clause 18 (cited from memory, not checked against
// the text): a header of $date, $version and $timescale sections, the scopes ($scope module ...
// $upscope $end) holding one-bit variables ($var wire 1 <code> <name> $end), $enddefinitions $end,
// then "#0" and a $dumpvars ... $end section with every variable's initial value, then "#<time>"
// lines in increasing time, each followed by the value changes of that instant ("0<code>",
// "1<code>"). Identifier codes are strings of printable ASCII characters 33 ('!') to 126 ('~').
//
// Times are integers in the timescale unit. Kernel times are exact picoseconds, so the default unit
// of 1 ps keeps every edge exact; a caller may ask for a coarser power of ten (10 ns, 1 us...) to
// make the file smaller or to suit a reader that expands it into samples at the unit's rate. A
// change whose time is not a multiple of the unit is placed at the nearest multiple (exact halves
// go up, but never past the run's end) and counted in rounded_changes(); coarsest_exact_unit()
// finds the coarsest unit that keeps a given set of times exact.
//
// Two changes of one signal at one instant (a glitch, or two edges a coarse unit merged) are both
// written, in order, under the same "#<time>": the file says exactly what the model reported. A
// change to the level a signal already has is not a change and is dropped. Readers differ on
// glitches: gtkwave's vcd2fst and fst2vcd keep both changes in order (tests/waves checks it);
// sigrok's VCD input, which turns the file into samples, keeps only the last value of the instant
// (tried by hand with sigrok-cli 0.7.2), so a zero-width pulse is invisible there.
//
// Speed matters (a waveform should cost little beside the simulation it records): every
// per-signal string is built once in begin(), changes are appended to one large buffer with
// hand-made integer formatting (eight digits at once), and full buffers go to the file in big
// std::fwrite calls. A writer thread can make those calls, overlapping the copy into the operating
// system with the simulation (two buffers, swapped); it is off by default, because on the 2-core
// development machine it made a run slower, not faster (vcd_overhead 2.15 with it, 1.65 without:
// DEVELOPERS.md, "Benchmarks"). When a buffer
// fills, only the complete time steps are handed over and the current one is kept, so the file on
// disk always ends on a time-step boundary and a run that dies mid-way leaves a readable file up to
// that point. A write failure on that thread surfaces as output_error from the next call that
// hands over data (change(), flush() or end()).

#include "sim/clock_domain.h"
#include "sim/signal_sink.h"

#include <condition_variable>
#include <cstdint>
#include <cstdio>
#include <memory>
#include <mutex>
#include <stdexcept>
#include <string>
#include <thread>
#include <vector>

namespace sim {

// Thrown when an output file cannot be opened, written or closed; the message names the file and
// the operating system's reason.
class output_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

// How a vcd_writer writes its file.
struct vcd_options {
    // Timescale unit in ps: 1, 10 or 100 times a power of a thousand from 1 ps to 100 s.
    time_ps unit_ps = 1;
    // Text of the $date section; empty: the current UTC time (give a fixed text for files that
    // must compare byte for byte between runs).
    std::string date;
    // Text of the $version section.
    std::string version = "tickbench";
    // Size of the output buffer in bytes (at least 4 KiB); a second one as large is used when
    // writing on a thread.
    std::size_t buffer_bytes = std::size_t{1} << 20;
    // Write full buffers from a thread of the writer's own, overlapping the copy into the operating
    // system with the simulation; false (the default) writes from the calling thread.
    bool writer_thread = false;
    // The run's end: no time after it is written. A change rounded past it (a coarse unit that
    // does not divide it) is placed at the last multiple of the unit at or before it.
    time_ps end_ps = max_time_ps;
};

class vcd_writer final : public signal_sink {
public:
    // Creates (truncates) the file at `path`; throws output_error if it cannot be opened and
    // std::invalid_argument if the options are out of range.
    explicit vcd_writer(std::string path, vcd_options options = {});
    // Finishes the file as end() would at the last time written; errors are logged, not thrown.
    ~vcd_writer() override;
    vcd_writer(const vcd_writer&) = delete;
    vcd_writer& operator=(const vcd_writer&) = delete;

    // Records a signal; ids must come densely from 0. Scopes are split on '.' into nested modules;
    // characters a VCD name cannot hold (white space, control characters) become '_'.
    void declare(signal_id id, const signal_info& info) override;
    // Writes the header, the definitions and the initial values.
    void begin() override;
    // Appends a value change; throws std::logic_error if time goes backwards (as seen in timescale
    // units), lies after the options' end or the id is unknown, output_error if the file cannot be
    // written.
    void change(signal_id id, bool level, time_ps at) override;
    // Writes the final time (the last multiple of the unit at or before `at` and the options' end,
    // so the file never shows a time after the run), flushes and closes the file; throws
    // output_error on a write failure. Later calls do nothing.
    void end(time_ps at) override;
    // Writes every complete time step to the file and waits until it is there (the step in
    // progress stays in memory, so the file still ends on a step boundary); throws output_error on
    // a write failure.
    void flush();

    // The file being written.
    const std::string& path() const { return path_; }
    // The timescale unit in ps.
    time_ps unit() const { return unit_; }
    // How many changes were moved to the nearest multiple of the unit (0 keeps every edge exact).
    std::uint64_t rounded_changes() const { return rounded_; }
    // How many value changes were written (the $dumpvars values excluded).
    std::uint64_t changes_written() const { return written_; }

    // The timescale text of a valid unit ("1 ps", "10 ns", "100 us"); throws std::invalid_argument
    // for any other value.
    static std::string timescale_text(time_ps unit_ps);
    // The coarsest valid unit, no coarser than `limit_ps`, of which every time in `times` is a
    // multiple (1 ps when nothing coarser fits).
    static time_ps coarsest_exact_unit(const std::vector<time_ps>& times,
                                       time_ps limit_ps = ps_per_second);
    // The identifier code of signal `id`: "!" .. "~", then "!!", "\"!"... (bijective base 94).
    static std::string identifier_code(signal_id id);

private:
    // What change() touches, kept small so many signals stay in cache.
    struct signal {
        char code[8] = {};             // identifier code and '\n', zero padded
        std::uint8_t code_length = 0;  // code plus the newline
        bool level = false;            // last level written
    };

    // Makes room for `n` more bytes in the buffer, writing out complete time steps if needed.
    void reserve(std::size_t n) {
        if (used_ + n > capacity_) make_room(n);
    }
    [[gnu::noinline]] void make_room(std::size_t n);
    // Throws the std::logic_error change() owes a change it cannot take.
    [[noreturn, gnu::noinline, gnu::cold]] void refuse_change(signal_id id, time_ps at) const;
    // `at` in timescale units, rounded to the nearest one (counted in rounded_), never past the
    // end.
    [[gnu::noinline]] std::uint64_t to_units(time_ps at);
    // Hands buffer bytes [0, n) to the writer thread (started on first use) and keeps the rest;
    // throws output_error if an earlier write failed.
    void write_out(std::size_t n);
    // Waits until the writer thread has written everything handed to it.
    void drain();
    void stop_worker();
    void run_worker();
    // Stops writing after a failure: closes the file and throws output_error.
    [[noreturn]] void abandon(const char* what, int err);
    // Appends "#<t>\n" and marks the start of a time step.
    void append_time(std::uint64_t t);
    void append(const char* s, std::size_t n);
    void append(const std::string& s) { append(s.data(), s.size()); }
    // Writes the header sections and the scope tree.
    void write_header();
    // Closes the file, turning a failure into output_error.
    void close_file();
    [[noreturn]] void fail(const char* what, int err);

    std::string path_;
    vcd_options options_;
    time_ps unit_;
    std::FILE* file_ = nullptr;
    std::unique_ptr<char[]> buffer_;  // being filled
    std::unique_ptr<char[]> spare_;   // being written by the worker, or free
    std::size_t capacity_ = 0;
    std::size_t used_ = 0;
    std::size_t step_start_ = 0;  // buffer offset of the current "#<time>" line
    std::vector<signal> signals_;
    std::vector<signal_info> infos_;  // by id, names made VCD-safe
    std::uint64_t last_time_ = 0;     // in units, of the current time step
    std::uint64_t high_value_ = 0;    // last time / 10^8, kept formatted in high_digits_
    char high_digits_[16] = {};
    std::uint32_t high_length_ = 0;
    bool begun_ = false;
    bool ended_ = false;
    std::uint64_t rounded_ = 0;
    std::uint64_t written_ = 0;

    // The writer thread and what it shares with the filling thread, under mutex_.
    std::thread worker_;
    std::mutex mutex_;
    std::condition_variable work_;  // work_ready_ or stopping_ became true
    std::condition_variable idle_;  // work_ready_ became false
    bool work_ready_ = false;       // spare_ holds work_bytes_ bytes to write
    std::size_t work_bytes_ = 0;
    bool stopping_ = false;
    int worker_error_ = 0;  // errno of the first failed write
};

}  // namespace sim
