#pragma once
// What a sweep runs (docs/cli.md, "sweep"): its axes, each a name and the list of values it takes,
// and the points they span. The axes come from `--vary AXIS=VALUES`; their product is the set of
// points, numbered in the order of nested loops with the first axis outermost and the last axis
// changing fastest. A point turns into the scenario_overrides of one run. A shard (`--shard K/N`)
// is the fixed subset of points whose index modulo N is K-1.
//
// Values are kept as the text a run receives, computed exactly: integer ranges in 64-bit integers,
// quantity ranges as exact fractions, so "7.9 MHz..8.1 MHz/5" gives 7.95 MHz and not a float's
// neighbour of it. Plain C++: parsing and enumeration are unit-tested without a kernel.

#include "harness/run/scenario.h"

#include <cstdint>
#include <stdexcept>
#include <string>
#include <vector>

namespace harness::run {

// A `--vary`, `--shard` or sweep input that cannot be used; the message quotes it, says what was
// wrong and what would be accepted. The command maps it to exit code 2.
class sweep_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

struct sweep_axis {
    enum class kind { start_offset, seed, param, key };
    std::string
        name;  // as written: "start-offset", "seed", "param.variant", "clocks.xtal.frequency"
    kind what = kind::key;
    std::string target;  // the parameter name (param) or the dotted key path (key)
    std::string spec;    // the VALUES text as given
    std::vector<std::string> values;
};

// Parses "AXIS=VALUES". VALUES is a list "a,b,c", an integer range "A..B" or "A..B/STEP" (both
// ends included; with a step, the last value is the largest A + k STEP not above B), or a quantity
// range "A UNIT..B UNIT/COUNT" (COUNT points, both ends included, same unit on both ends, every
// point a finite decimal). Throws sweep_error.
sweep_axis parse_axis(const std::string& text);

// The values of VALUES alone (see parse_axis). Throws sweep_error naming `axis` in its message.
std::vector<std::string> parse_values(const std::string& axis, const std::string& values);

// Which points a run covers: those whose index modulo `count` is `number` - 1.
struct shard {
    std::uint64_t number = 1;
    std::uint64_t count = 1;
    bool includes(std::uint64_t point) const { return point % count == number - 1; }
    bool whole() const { return count == 1; }
    std::string text() const { return std::to_string(number) + "/" + std::to_string(count); }
};

// Parses "K/N" (1 <= K <= N). Throws sweep_error.
shard parse_shard(const std::string& text);

class sweep_plan {
public:
    // Throws sweep_error when no axis is given, an axis appears twice, or there are more than
    // max_points points.
    explicit sweep_plan(std::vector<sweep_axis> axes);

    static constexpr std::uint64_t max_points = std::uint64_t{1} << 32;

    const std::vector<sweep_axis>& axes() const { return axes_; }
    std::uint64_t points() const { return points_; }
    // The position of each axis's value at `point` (first axis outermost).
    std::vector<std::size_t> positions(std::uint64_t point) const;
    // The point whose axes stand at `positions` (the inverse of positions()).
    std::uint64_t index_of(const std::vector<std::size_t>& positions) const;
    // The value of each axis at `point`.
    std::vector<std::string> values(std::uint64_t point) const;
    // "start-offset=3 param.variant=naive": the point's name in reports.
    std::string point_name(std::uint64_t point) const;
    // The overrides of one run at `point`, on top of `base`.
    scenario_overrides overrides(std::uint64_t point, const scenario_overrides& base = {}) const;

private:
    std::vector<sweep_axis> axes_;
    std::uint64_t points_ = 1;
};

}  // namespace harness::run
