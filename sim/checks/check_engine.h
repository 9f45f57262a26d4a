#pragma once
// The streaming check engine: a signal_sink that evaluates declarative checks while the
// simulation runs (docs/architecture.md, "Outputs").
//
// The waveform is never stored. Each check keeps a fixed handful of integers (see
// detail/check_state.h), and the engine keeps one level per signal and, per signal, the list of
// checks that watch it, all sized when the run begins; after begin() no change or instant
// allocates (a check's first failure builds its sentence once). Verdicts are decided on exact
// picosecond integers; results() converts them for the reports at the end.

#include "sim/checks/check_result.h"
#include "sim/checks/check_spec.h"
#include "sim/signal_sink.h"

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <vector>

namespace sim {

namespace detail {
class check_state;
}

class check_engine final : public signal_sink {
public:
    // An engine for `specs`; throws std::invalid_argument listing every problem validate() finds
    // ("check 'pwm_period': tolerance: ...").
    explicit check_engine(std::vector<check_spec> specs);
    ~check_engine() override;
    check_engine(const check_engine&) = delete;
    check_engine& operator=(const check_engine&) = delete;

    // Records signal `id` as "scope.name" with its initial level; ids must come densely from 0.
    void declare(signal_id id, const signal_info& info) override;
    // Resolves every check's signal names ("scope.name", or a bare name that is unique); throws
    // std::invalid_argument naming the check, the unknown signal and the declared ones.
    void begin() override;
    // Throws std::logic_error when time goes backwards, the id is unknown or the run is not
    // between begin() and end().
    void change(signal_id id, bool level, time_ps at) override;
    // Decides every verdict; results() is ready afterwards. Later calls do nothing.
    void end(time_ps at) override;

    // `listener(check, at)` is called once per check, in spec order of index, when that check
    // first fails (at the change, instant or end that reveals it; `at` is the failure's time).
    // The report keeps the waveform around each first failure through it.
    void set_failure_listener(std::function<void(std::size_t check, time_ps at)> listener);
    // Number of checks.
    std::size_t check_count() const { return checks_.size(); }
    // The signal ids check `check` watches, slot by slot (after begin()).
    const std::vector<signal_id>& check_signals(std::size_t check) const;

    // One result per check, in spec order (empty before end()).
    const std::vector<check_result>& results() const { return results_; }
    // True after end() when every check passed.
    bool all_passed() const;
    // Bytes of state the engine and its checks hold; constant from begin() to end().
    std::size_t footprint_bytes() const;

private:
    struct edge_target {
        detail::check_state* check;
        std::uint32_t slot;
    };
    // Hands the finished instant to the instant-driven checks whose signals changed in it.
    void flush_instant();
    // The id of `name`, or throws.
    signal_id resolve(const std::string& check, const std::string& name) const;

    std::vector<std::unique_ptr<detail::check_state>> checks_;
    std::vector<std::string> names_;    // full signal names by id
    std::vector<std::uint8_t> levels_;  // current level by id
    // Per signal id s: edge_targets_[edge_first_[s] .. edge_first_[s + 1]) and the same for
    // instant_targets_ (check indices).
    std::vector<std::uint32_t> edge_first_;
    std::vector<edge_target> edge_targets_;
    std::vector<std::uint32_t> instant_first_;
    std::vector<std::uint32_t> instant_targets_;
    std::vector<std::uint32_t> dirty_;  // instant-driven checks touched in the current instant
    std::vector<std::uint8_t> is_dirty_;
    time_ps instant_ = 0;
    bool begun_ = false;
    bool ended_ = false;
    std::vector<check_result> results_;
};

}  // namespace sim
