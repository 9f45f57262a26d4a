#pragma once
// Glitches: short pulses laid over another source, to show what an input filter lets through.
//
// Each glitch inverts the underlying level for its width: the result is the base level XOR "inside
// a glitch", so a glitch on a low line is a short high pulse and on a high line a short low one. A
// base edge inside a glitch window shows at the window's end; a base edge and a glitch edge at the
// same instant cancel. Glitches come at listed times, or at seeded random times: the gap from one
// glitch's start to the next is drawn uniformly from [width + 1, 2 x mean - width - 1] ps (mean =
// 1 / rate), so the mean rate is exact and glitches never overlap. Draw i is a pure function of the
// seed and i.

#include "sim/frequency.h"
#include "sim/stimulus/edge_source.h"

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace sim::stimulus {

struct glitch_settings {
    time_ps width = 0;              // above 0
    std::vector<time_ps> at;        // listed glitch starts, each after the previous one's end
    std::optional<frequency> rate;  // or: random glitches at this mean rate
    std::uint64_t seed = 0;         // seeds the random starts
    time_ps start = 0;              // random glitches begin after this
    std::optional<time_ps> stop;    // and none starts at or after this
};

// What is wrong with `s`, one sentence each; empty when fine.
std::vector<std::string> glitch_problems(const glitch_settings& s);

class glitch_overlay final : public edge_source {
public:
    // Throws std::invalid_argument with the first of glitch_problems().
    glitch_overlay(std::unique_ptr<edge_source> base, const glitch_settings& s);

    bool initial_level() const override { return base_->initial_level(); }
    std::optional<edge> next_edge(time_ps from) override;

private:
    // The start of glitch i, or nothing when there is none.
    std::optional<time_ps> glitch_start(std::uint64_t i);

    std::unique_ptr<edge_source> base_;
    glitch_settings s_;
    time_ps mean_gap_ = 0;
    // Cursor: every change before x_ is consumed.
    time_ps x_ = 0;
    bool base_level_;
    bool inside_ = false;
    bool level_;
    std::uint64_t index_ = 0;            // the next glitch to start (or the one inside)
    std::optional<time_ps> next_start_;  // its start, when known
    bool next_known_ = false;
    std::optional<edge> last_;  // the last edge returned, for a repeated question
};

}  // namespace sim::stimulus
