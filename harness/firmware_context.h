#pragma once
// What the firmware API reaches besides the cpu: the scenario's firmware parameters, and the
// firmware's own checks (TICK_ASSERT / tick_check), which land in the run's assertion log.
//
// A firmware check may run once per tick for hours of simulated time, so its evaluations are never
// kept as a history: each check (a name at a file and line) keeps counts of passes and failures,
// its first failure and a small fixed ring of its last evaluations. Memory grows with the number
// of distinct checks in the firmware's text, never with the run's length.

#include "sim/clock_domain.h"

#include <array>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace harness {

// One tick_check() call.
struct firmware_check {
    std::string name;
    std::string file;
    int line = 0;
    bool passed = false;
    sim::time_ps at = 0;
};

// One evaluation of a firmware check, as the ring of recent evaluations keeps it.
struct firmware_evaluation {
    bool passed = false;
    sim::time_ps at = 0;
};

// Everything kept about one firmware check: its name and place, how often it held and failed, its
// first failure and its last few evaluations.
struct firmware_check_record {
    // How many of the last evaluations are kept.
    static constexpr std::size_t recent_capacity = 8;

    std::string name;
    std::string file;
    int line = 0;
    bool passed = true;  // every evaluation so far held
    std::uint64_t passes = 0;
    std::uint64_t failures = 0;
    sim::time_ps first_at = 0;  // the first evaluation
    sim::time_ps last_at = 0;   // the latest evaluation
    // The first failure: its time and its number among the evaluations (from 1); 0 when none.
    sim::time_ps first_failure_at = 0;
    std::uint64_t first_failure_evaluation = 0;
    // The time of the first failure, or of the latest evaluation when none failed.
    sim::time_ps at = 0;

    // Counts one evaluation.
    void add(bool held, sim::time_ps when);
    // How often the check was evaluated.
    std::uint64_t evaluations() const { return passes + failures; }
    // The last evaluations, oldest first (at most recent_capacity).
    std::vector<firmware_evaluation> recent() const;
    // Sets the last evaluations (oldest first, at most recent_capacity of them, the latest being
    // evaluation number evaluations()): for a record rebuilt from a copy, e.g. one read back from
    // a child process.
    void restore_recent(const std::vector<firmware_evaluation>& last);

private:
    std::array<firmware_evaluation, recent_capacity> ring_{};
};

// The firmware checks of a run: one record per distinct name, file and line, in the order of their
// first evaluation. Recording an evaluation of a known check allocates nothing.
class firmware_check_log {
public:
    // Counts an evaluation of the check `name` at `file`:`line`; returns its record (valid until
    // the next record() or clear()).
    const firmware_check_record& record(std::string_view name, std::string_view file, int line,
                                        bool passed, sim::time_ps at);
    // Every check's record, in the order of first evaluation.
    const std::vector<firmware_check_record>& records() const { return records_; }
    // True before any check was evaluated.
    bool empty() const { return records_.empty(); }
    // Forgets every check (a new run).
    void clear();
    // Bytes held, heap included (a test's measure that memory does not grow with evaluations).
    std::size_t footprint_bytes() const;

private:
    // A check's identity as the caller gives it: looked up without copying the strings.
    struct place {
        std::string_view name;
        std::string_view file;
        int line;
    };
    // The same, owned by the index.
    struct key {
        std::string name;
        std::string file;
        int line;
    };
    struct key_less {
        using is_transparent = void;
        static place view(const place& p) { return p; }
        static place view(const key& k) { return {k.name, k.file, k.line}; }
        template <class a_type, class b_type>
        bool operator()(const a_type& a, const b_type& b) const {
            const place x = view(a), y = view(b);
            if (x.line != y.line) return x.line < y.line;
            if (x.file != y.file) return x.file < y.file;
            return x.name < y.name;
        }
    };
    // Index of the record of `p`, added when new.
    std::size_t find_or_add(const place& p);

    std::vector<firmware_check_record> records_;
    std::map<key, std::size_t, key_less> index_;
};

class firmware_context {
public:
    // The context of the run in this process.
    static firmware_context& get();

    std::map<std::string, std::string> params;
    firmware_check_log checks;
    // Called on a failed firmware check, after it is recorded (ends the run).
    std::function<void(const firmware_check&)> on_failed_check;
    // Receives each tick_log() line (already formatted), with the simulated time.
    std::function<void(sim::time_ps, const std::string&)> on_log;
};

}  // namespace harness
