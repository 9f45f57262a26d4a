// The `plan` subcommand; see commands.h and harness/run/period_plan.h.

#include "harness/cli/commands.h"

#include "harness/run/period_plan.h"
#include "sim/quantity.h"

#include <cstdio>
#include <string>
#include <vector>

namespace harness::cli {

int run_plan(const plan_options& options, std::ostream& out) {
    harness::run::plan_request rq;
    rq.clock = sim::parse_frequency(options.clock);
    rq.target = sim::parse_frequency(options.target);
    if (rq.clock.is_zero()) throw sim::quantity_error("--clock: expected a frequency above 0 Hz");
    if (rq.target.is_zero()) throw sim::quantity_error("--target: expected a frequency above 0 Hz");
    rq.counter_bits = options.width;
    rq.center = options.center;
    rq.max_results = options.max;
    const auto choices = harness::run::plan_periods(rq);
    out << "clock " << rq.clock.pretty() << " (" << rq.clock.exact_string() << "), target "
        << rq.target.pretty() << ", "
        << (rq.center ? "center-aligned: f = clock / ((prescaler + 1) x 2 x period)"
                      : "edge-aligned: f = clock / ((prescaler + 1) x (period + 1))")
        << ", " << rq.counter_bits << "-bit counter, " << rq.prescaler_bits << "-bit prescaler\n";
    if (choices.empty()) {
        out << "no prescaler and period reach the target with these widths\n";
        return exit_ok;
    }
    if (choices.front().off_by_more_than_a_percent()) {
        // Above the fastest PWM (two compare steps, no prescaling) or below the slowest.
        const unsigned k = rq.center ? 4 : 2;
        const sim::frequency fastest(rq.clock.num(), rq.clock.den() * k);
        out << "note: no setting comes within 1 % of the target (the nearest is "
            << choices.front().error_ppm_text() << " ppm off): ";
        if (choices.front().below)
            out << "the fastest PWM this clock makes is clock / " << k << " = " << fastest.pretty()
                << " (two compare steps, no prescaling)\n";
        else
            out << "the slowest PWM this clock makes has the prescaler and the period at their "
                   "maximum\n";
    }
    // Columns: prescaler, period, achieved (decimal), exact fraction, error, resolution.
    std::vector<std::vector<std::string>> rows = {
        {"prescaler", "period", "achieved (Hz)", "exact (Hz)", "error (ppm)", "resolution (bits)"}};
    for (const auto& c : choices) {
        const std::string exact = c.achieved.den() == 1 ? std::to_string(c.achieved.num())
                                                        : std::to_string(c.achieved.num()) + "/" +
                                                              std::to_string(c.achieved.den());
        rows.push_back({std::to_string(c.prescaler), std::to_string(c.period),
                        c.achieved.decimal_string(), exact, c.error_ppm_text(),
                        c.resolution_bits_text()});
    }
    std::vector<std::size_t> width(rows[0].size(), 0);
    for (const auto& r : rows)
        for (std::size_t i = 0; i < r.size(); ++i) width[i] = std::max(width[i], r[i].size());
    for (const auto& r : rows) {
        std::string line;
        for (std::size_t i = 0; i < r.size(); ++i) {
            const std::string pad(width[i] - r[i].size(), ' ');
            line += (i == 0 ? "" : "  ") + (i < 2 || i == 5 ? r[i] + pad : pad + r[i]);
        }
        while (!line.empty() && line.back() == ' ') line.pop_back();
        out << line << "\n";
    }
    return exit_ok;
}

}  // namespace harness::cli
