#include "tests/differential/program_runner.h"

#include <algorithm>
#include <exception>
#include <sstream>

namespace tickbench::differential {

using test_support::timer_event;

run_result run_program(const timer_program& p, const model_factory& make) {
    run_result r;
    sim::clock_domain domain(sim::frequency::hz(p.clock_hz));
    test_support::timer_event_log log;
    try {
        std::unique_ptr<models::timer_core_if> model = make(p.config, domain, &log);
        for (const program_op& op : p.ops) {
            const std::uint32_t v = apply_op(*model, domain, op);
            if (op.kind == op_kind::read) log.add_read(op.field, op.channel, v, op.at);
        }
        model->advance_to(p.end);
    } catch (const std::exception& e) {
        r.error = e.what();
    }
    r.events = log.canonical();
    for (const timer_event& e : r.events) {
        if (e.kind == test_support::timer_event_kind::read) continue;
        const auto edge = domain.edge_at_or_after(e.at);
        if (!edge || edge->at != e.at) {
            std::ostringstream s;
            s << e << " lies between two edges of the timer clock";
            r.off_clock = s.str();
            break;
        }
    }
    return r;
}

namespace {

std::string show(const std::vector<timer_event>& v, std::size_t i) {
    if (i >= v.size()) return "(no event)";
    std::ostringstream s;
    s << v[i];
    return s.str();
}

}  // namespace

std::optional<disagreement> compare_runs(const run_result& expected, const run_result& actual) {
    const auto& a = expected.events;
    const auto& b = actual.events;
    std::size_t i = 0;
    while (i < a.size() && i < b.size() && a[i] == b[i]) ++i;
    if (i == a.size() && i == b.size() && expected.error == actual.error) return std::nullopt;
    std::ostringstream s;
    if (i == a.size() && i == b.size()) {
        s << "same events, but errors differ: expected \"" << expected.error << "\", got \""
          << actual.error << "\"";
        return disagreement{i, s.str()};
    }
    s << "first difference at event " << i << ":\n";
    for (std::size_t k = i >= 3 ? i - 3 : 0; k < i; ++k) s << "    both:     " << a[k] << "\n";
    s << "    expected: " << show(a, i) << "\n";
    s << "    got:      " << show(b, i) << "\n";
    if (!actual.error.empty()) s << "    model under test threw: " << actual.error << "\n";
    if (!expected.error.empty()) s << "    oracle threw: " << expected.error << "\n";
    return disagreement{i, s.str()};
}

std::optional<disagreement> differ(const timer_program& p, const model_factory& expected,
                                   const model_factory& actual) {
    return compare_runs(run_program(p, expected), run_program(p, actual));
}

timer_program shrink(const timer_program& p, const model_factory& expected,
                     const model_factory& actual, std::size_t budget) {
    std::size_t runs = 0;
    // Dropping a change to a slow clock can stretch the run by millions of ticks: such a program
    // is no smaller, and would cost the tick-exact reference seconds.
    const std::uint64_t tick_limit = 4 * run_ticks(p) + 10'000;
    auto fails = [&](const timer_program& q) {
        ++runs;
        return run_ticks(q) <= tick_limit && differ(q, expected, actual).has_value();
    };
    timer_program best = p;
    if (!fails(best)) return best;

    // Cut the run short: stop just after the first differing event, dropping later operations.
    auto cut_at_difference = [&] {
        const run_result e = run_program(best, expected);
        const run_result a = run_program(best, actual);
        const auto d = compare_runs(e, a);
        if (!d) return;
        sim::time_ps t = 0;
        if (d->index < e.events.size()) t = e.events[d->index].at;
        if (d->index < a.events.size()) t = std::max(t, a.events[d->index].at);
        if (d->index >= e.events.size() && d->index >= a.events.size()) return;
        timer_program q = best;
        q.end = std::min(q.end, t);
        q.ops.erase(std::remove_if(q.ops.begin(), q.ops.end(),
                                   [&](const program_op& op) { return op.at > q.end; }),
                    q.ops.end());
        if (fails(q)) best = q;
    };
    cut_at_difference();

    // Remove chunks of operations, halving the chunk size down to single operations.
    std::size_t chunk = std::max<std::size_t>(1, best.ops.size() / 2);
    while (runs < budget) {
        bool removed_any = false;
        for (std::size_t start = 0; start < best.ops.size() && runs < budget;) {
            timer_program q = best;
            const std::size_t n = std::min(chunk, q.ops.size() - start);
            q.ops.erase(q.ops.begin() + static_cast<std::ptrdiff_t>(start),
                        q.ops.begin() + static_cast<std::ptrdiff_t>(start + n));
            if (fails(q)) {
                best = q;
                removed_any = true;
            } else {
                start += n;
            }
        }
        if (chunk == 1 && !removed_any) break;
        if (!removed_any) chunk = std::max<std::size_t>(1, chunk / 2);
    }
    cut_at_difference();
    return best;
}

std::string report_disagreement(const timer_program& original, const model_factory& expected,
                                const model_factory& actual) {
    std::ostringstream s;
    s << "models disagree on seed " << original.seed << "\n";
    const timer_program small = shrink(original, expected, actual);
    s << "shrunk from " << original.ops.size() << " to " << small.ops.size() << " operations:\n"
      << describe(small);
    if (const auto d = differ(small, expected, actual)) s << d->text;
    return s.str();
}

}  // namespace tickbench::differential
