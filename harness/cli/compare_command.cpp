// The `compare` subcommand; see commands.h and docs/cli.md for the output it prints.

#include "harness/cli/commands.h"

#include "sim/quantity.h"
#include "sim/vcd_compare.h"
#include "sim/vcd_reader.h"

#include <spdlog/spdlog.h>

#include <filesystem>
#include <system_error>

namespace harness::cli {

namespace {

// The waveform of a run: RUN/waves.vcd for an output folder, RUN itself for a file.
std::string waveform_of(const std::string& run) {
    namespace fs = std::filesystem;
    std::error_code ec;
    const fs::file_status status = fs::status(run, ec);
    if (!fs::exists(status))
        throw sim::vcd_error(run +
                             ": no such folder or file; expected the output folder of a run "
                             "(holding waves.vcd) or a VCD file");
    if (!fs::is_directory(status)) return run;
    const std::string vcd = (fs::path(run) / "waves.vcd").string();
    if (!fs::exists(vcd, ec))
        throw sim::vcd_error(vcd +
                             ": missing; expected the output folder of a run that wrote its "
                             "waveform (a run with [waves] enabled = false writes none)");
    return vcd;
}

std::string plural(std::uint64_t n, const char* one, const char* many) {
    return std::to_string(n) + " " + (n == 1 ? one : many);
}

void print_file(std::ostream& out, const char* side, const sim::vcd_reader& r, sim::time_ps end) {
    out << side << ": " << r.source() << ", " << plural(r.variables().size(), "signal", "signals")
        << ", ends at " << sim::format_time(end) << '\n';
}

void print_difference(std::ostream& out, const sim::vcd_difference& d) {
    using kind = sim::vcd_difference::kind;
    out << "  " << sim::format_time(d.at()) << ": ";
    switch (d.what) {
        case kind::shifted:
            out << "edge to " << d.value_a << " at " << sim::format_time(d.at_a) << " in a, at "
                << sim::format_time(d.at_b) << " in b, "
                << sim::format_time(d.at_a > d.at_b ? d.at_a - d.at_b : d.at_b - d.at_a)
                << " apart\n";
            break;
        case kind::value:
            out << "to " << d.value_a << " in a at " << sim::format_time(d.at_a) << ", to "
                << d.value_b << " in b at " << sim::format_time(d.at_b) << '\n';
            break;
        case kind::only_a:
        case kind::only_b: {
            const bool a = d.what == kind::only_a;
            const char* side = a ? "a" : "b";
            if (d.count == 1)
                out << "edge to " << (a ? d.value_a : d.value_b) << " only in " << side << '\n';
            else
                out << d.count << " edges only in " << side << ", the first to "
                    << (a ? d.value_a : d.value_b) << ", the last at "
                    << sim::format_time(a ? d.last_a : d.last_b) << '\n';
            break;
        }
    }
}

void print_signal(std::ostream& out, const sim::vcd_signal_comparison& s) {
    if (!s.in_a || !s.in_b) {
        out << s.name << ": only in " << (s.in_a ? "a" : "b")
            << (s.counts ? "" : ", not compared (--common-only)") << '\n';
        return;
    }
    if (s.width_a != s.width_b) {
        out << s.name << ": " << plural(s.width_a, "bit", "bits") << " wide in a, "
            << plural(s.width_b, "bit", "bits") << " in b\n";
        return;
    }
    out << s.name << ": " << plural(s.differences, "difference", "differences") << " ("
        << plural(s.edges_a, "edge", "edges") << " in a, " << s.edges_b << " in b)\n";
    for (const sim::vcd_difference& d : s.kept) print_difference(out, d);
    if (s.differences > s.kept.size())
        out << "  ... and " << s.differences - s.kept.size() << " more\n";
}

}  // namespace

int run_compare_command(const compare_options& options, std::ostream& out) {
    sim::vcd_compare_options o;
    o.tolerance = sim::parse_time(options.tolerance);
    o.signals = options.signals;
    o.only_common = options.common_only;
    const std::string path_a = waveform_of(options.run_a);
    const std::string path_b = waveform_of(options.run_b);
    sim::vcd_reader a(path_a);
    sim::vcd_reader b(path_b);
    const sim::vcd_comparison c = sim::compare_vcd(a, b, o);
    spdlog::info("compared {} with {}: {} signals", path_a, path_b, c.signals.size());

    print_file(out, "a", a, c.end_a);
    print_file(out, "b", b, c.end_b);
    std::uint64_t edges = 0;
    for (const sim::vcd_signal_comparison& s : c.signals) {
        edges += s.edges_a;
        if (!s.same()) print_signal(out, s);
    }
    if (c.ends_differ)
        out << "end: " << sim::format_time(c.end_a) << " in a, " << sim::format_time(c.end_b)
            << " in b\n";
    const std::string within = "tolerance " + sim::format_time(o.tolerance);
    if (c.same()) {
        out << "same: " << plural(c.signals.size(), "signal", "signals") << ", "
            << plural(edges, "edge", "edges") << ", " << within << '\n';
        return exit_ok;
    }
    out << "differ: " << c.differing_signals() << " of "
        << plural(c.signals.size(), "signal", "signals") << (c.ends_differ ? " and the end" : "")
        << ", " << within << '\n';
    return exit_check_failed;
}

}  // namespace harness::cli
