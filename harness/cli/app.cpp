// The command line of `tickbench`: options, subcommands, logging set-up and the mapping of errors
// onto exit codes (docs/cli.md). The only translation unit that includes CLI11.

#include "harness/cli/commands.h"

#include "harness/firmware_library.h"
#include "harness/run/log_setup.h"
#include "harness/run/sweep_plan.h"
#include "sim/clock_tree.h"
#include "sim/quantity.h"
#include "sim/report/report_model.h"
#include "sim/scenario_error.h"
#include "sim/vcd_reader.h"
#include "sim/vcd_writer.h"
#include "sim/word_hint.h"

#include <spdlog/spdlog.h>
#include <CLI/CLI.hpp>

#include <unistd.h>
#include <algorithm>
#include <iostream>
#include <sstream>

namespace harness::cli {

namespace {

// Writes `message` to stderr, each line prefixed so that a multi-finding error greps cleanly.
void report_error(const std::string& message) {
    std::istringstream lines(message);
    std::string line;
    while (std::getline(lines, line)) std::cerr << "tickbench: error: " << line << '\n';
}

// The command named on the command line (the first word that is no option nor --log-level's
// value) if it is none of the app's subcommands, else "".
std::string unknown_command(const CLI::App& app, int argc, char** argv) {
    for (int i = 1; i < argc; ++i) {
        const std::string word = argv[i];
        if (word == "--log-level") {
            ++i;
            continue;
        }
        if (word.empty() || word[0] == '-') continue;
        for (const CLI::App* sub : app.get_subcommands({}))
            if (sub->get_name() == word) return "";
        return word;
    }
    return "";
}

std::vector<std::string> command_names(const CLI::App& app) {
    std::vector<std::string> names;
    for (const CLI::App* sub : app.get_subcommands({})) names.push_back(sub->get_name());
    return names;
}

// For arguments CLI11 did not expect: each unknown option of the command, with the closest one
// it has.
std::string unexpected_arguments(const CLI::App& app, const std::vector<std::string>& extras) {
    const CLI::App* command = nullptr;
    for (const CLI::App* sub : app.get_subcommands({}))
        if (sub->parsed()) command = sub;
    std::vector<std::string> options;
    for (const CLI::App* a : {command, &app}) {
        if (!a) continue;
        for (const CLI::Option* o : a->get_options())
            for (const std::string& name : o->get_lnames())
                if (std::find(options.begin(), options.end(), "--" + name) == options.end())
                    options.push_back("--" + name);
    }
    std::string message = "unexpected argument";
    message += extras.size() > 1 ? "s: " : ": ";
    for (std::size_t i = 0; i < extras.size(); ++i) {
        if (i) message += ", ";
        message += "'" + extras[i] + "'";
        if (extras[i].rfind("--", 0) == 0) {
            const std::string bare = extras[i].substr(0, extras[i].find('='));
            message += sim::hint(bare, options);
        }
    }
    if (command) message += "; '" + command->get_name() + "' takes: " + sim::join(options);
    return message;
}

}  // namespace

int run(int argc, char** argv) {
    CLI::App app{"Simulates microcontroller clock trees and counter/timer peripherals on the host.",
                 "tickbench"};
    app.set_version_flag("--version", std::string("tickbench ") + TICKBENCH_VERSION,
                         "Print the version and exit");
    std::string log_level = "warn";
    app.add_option("--log-level", log_level, "How much to log on stderr")
        ->check(CLI::IsMember({"trace", "debug", "info", "warn", "error", "critical", "off"}))
        ->capture_default_str();
    app.require_subcommand(1);
    app.fallthrough();  // --log-level may also follow the subcommand

    run_command_options run_opts;
    CLI::App* run_cmd = app.add_subcommand(
        "run", "Run SCENARIO against its firmware and write waves, checks and reports");
    run_cmd->add_option("SCENARIO", run_opts.file, "Scenario file (TOML, docs/scenario.md)")
        ->required();
    run_cmd->add_option(
        "--firmware", run_opts.firmware,
        "Firmware shared library, relative to the current folder (replaces [firmware] library)");
    run_cmd->add_option("--out", run_opts.out_dir, "Folder for the outputs (created if missing)")
        ->capture_default_str();
    run_cmd->add_option("--duration", run_opts.duration,
                        "Simulated time to run, e.g. \"10 ms\" (replaces [run] duration)");
    run_cmd->add_option("--seed", run_opts.seed, "Seed of the run (replaces [run] seed)");
    run_cmd->add_option(
        "--start-offset", run_opts.start_offset,
        "CPU cycles after time 0 at which the firmware starts (replaces [cpu] start-offset)");
    run_cmd
        ->add_option(
            "--param", run_opts.params,
            "Firmware parameter NAME=VALUE (replaces or adds to [firmware.parameters]); repeatable")
        // One value per --param: the scenario may follow it.
        ->allow_extra_args(false);

    sweep_command_options sweep_opts;
    CLI::App* sweep_cmd = app.add_subcommand(
        "sweep", "Run SCENARIO at every point of the --vary axes and report which points fail");
    sweep_cmd->add_option("SCENARIO", sweep_opts.file, "Scenario file (TOML, docs/scenario.md)")
        ->required();
    sweep_cmd
        ->add_option("--vary", sweep_opts.vary,
                     "AXIS=VALUES: start-offset, seed, param.NAME or a scenario key path, with a "
                     "list a,b,c, a range 0..63 or 0..100/5, or \"7.9 MHz..8.1 MHz/5\"; "
                     "repeatable, the first is the outermost")
        ->required()
        // One value per --vary: the scenario may follow it.
        ->allow_extra_args(false);
    sweep_cmd->add_option("--jobs", sweep_opts.jobs, "Points run at once (default: one per core)");
    sweep_cmd
        ->add_option("--points-per-process", sweep_opts.points_per_process,
                     "Points one process runs before a fresh one takes over (1: a process per "
                     "point, for firmware whose state outlives its own data)")
        ->check(CLI::Range(std::uint64_t{1}, std::uint64_t{1} << 32))
        ->capture_default_str();
    sweep_cmd->add_option("--shard", sweep_opts.shard,
                          "K/N: run only the points whose index modulo N is K-1");
    sweep_cmd
        ->add_option("--waves", sweep_opts.waves,
                     "Which points keep a run folder (waves and all) in DIR/points/INDEX")
        ->check(CLI::IsMember({"failing", "none", "all"}))
        ->capture_default_str();
    sweep_cmd
        ->add_option("--out", sweep_opts.out_dir, "Folder for the outputs (created if missing)")
        ->capture_default_str();
    sweep_cmd->add_option("--firmware", sweep_opts.firmware,
                          "Firmware shared library, relative to the current folder");
    sweep_cmd->add_option("--duration", sweep_opts.duration,
                          "Simulated time of every point, e.g. \"10 ms\"");

    merge_options merge_opts;
    CLI::App* merge_cmd = app.add_subcommand(
        "merge", "Join the output folders of the shards of one sweep into the whole sweep's");
    merge_cmd->add_option("DIR", merge_opts.dirs, "The shards' output folders")->required();
    merge_cmd->add_option("--out", merge_opts.out_dir, "Folder for the merged reports")->required();

    std::string check_file;
    CLI::App* check_cmd = app.add_subcommand(
        "check", "Validate SCENARIO (tables, layouts, checks, firmware) without running it");
    check_cmd->add_option("SCENARIO", check_file, "Scenario file (TOML)")->required();

    clocks_options clocks;
    CLI::App* clocks_cmd =
        app.add_subcommand("clocks", "Print the clock plan of the [clocks] tables in SCENARIO");
    clocks_cmd->add_option("SCENARIO", clocks.file, "Scenario or part description (TOML)")
        ->required();
    clocks_cmd->add_flag("--json", clocks.json, "Print the plan as JSON instead of a table");

    layout_options layout;
    CLI::App* layout_cmd = app.add_subcommand(
        "layout", "Load a register layout file and print its registers, fields and value tables");
    layout_cmd->add_option("FILE", layout.file, "Register layout (TOML, docs/register-layouts.md)")
        ->required();
    layout_cmd->add_flag("--json", layout.json, "Print the layout as JSON instead of a table");

    plan_options plan;
    CLI::App* plan_cmd = app.add_subcommand(
        "plan", "List prescaler and period settings that reach a target frequency, best first");
    plan_cmd->add_option("--clock", plan.clock, "The timer's clock, e.g. \"48 MHz\"")->required();
    plan_cmd->add_option("--target", plan.target, "The output frequency wanted, e.g. \"25 kHz\"")
        ->required();
    plan_cmd->add_option("--width", plan.width, "Counter width in bits (the prescaler has 16)")
        ->check(CLI::Range(1u, 32u))
        ->capture_default_str();
    plan_cmd->add_flag("--center", plan.center, "Center-aligned counting (up and down)");
    plan_cmd->add_option("--max", plan.max, "How many choices to list")
        ->check(CLI::Range(1u, 10000u))
        ->capture_default_str();

    report_options report_opts;
    CLI::App* report_cmd = app.add_subcommand(
        "report", "Write DIR/report.html again from the report.json a run left in DIR");
    report_cmd->add_option("DIR", report_opts.dir, "The output folder of a run")->required();
    compare_options compare;
    CLI::App* compare_cmd = app.add_subcommand(
        "compare", "Compare the waveforms of two runs edge by edge and list the differences");
    compare_cmd->add_option("RUN_A", compare.run_a, "The first run's output folder (or a VCD file)")
        ->required();
    compare_cmd
        ->add_option("RUN_B", compare.run_b, "The second run's output folder (or a VCD file)")
        ->required();
    compare_cmd
        ->add_option("--signals", compare.signals,
                     "NAME,...: compare only these signals (full names such as pwm.channel1)")
        ->delimiter(',')
        ->allow_extra_args(false);
    compare_cmd
        ->add_option("--tolerance", compare.tolerance,
                     "Largest time between two edges that still match, e.g. \"5 ns\"")
        ->capture_default_str();
    compare_cmd->add_flag(
        "--common-only", compare.common_only,
        "Compare only the signals both runs have (others are listed, not counted)");

    // An unknown command is named, with the closest one, even when --help follows it.
    if (const std::string word = unknown_command(app, argc, argv); !word.empty()) {
        report_error("unknown command '" + word + "'" + sim::hint(word, command_names(app)) +
                     "; accepted: " + sim::join(command_names(app)));
        std::cerr << "Run 'tickbench --help' for usage.\n";
        return exit_bad_input;
    }
    try {
        app.parse(argc, argv);
    } catch (const CLI::ExtrasError&) {
        report_error(unexpected_arguments(app, app.remaining()));
        std::cerr << "Run 'tickbench --help' for usage.\n";
        return exit_bad_input;
    } catch (const CLI::ParseError& e) {
        if (e.get_exit_code() == 0) return app.exit(e);  // --help, --version
        report_error(e.what());
        std::cerr << "Run 'tickbench --help' for usage.\n";
        return exit_bad_input;
    }

    try {
        harness::run::set_up_logging(log_level);
        if (*run_cmd) {
            run_opts.progress = isatty(STDERR_FILENO) == 1;
            return run_scenario_command(run_opts, std::cout);
        }
        if (*sweep_cmd) {
            sweep_opts.progress = isatty(STDERR_FILENO) == 1;
            return run_sweep_command(sweep_opts, std::cout);
        }
        if (*merge_cmd) return run_merge_command(merge_opts, std::cout);
        if (*check_cmd) return run_check(check_file, std::cout);
        if (*clocks_cmd) return run_clocks(clocks, std::cout);
        if (*plan_cmd) return run_plan(plan, std::cout);
        if (*layout_cmd) return run_layout(layout, std::cout);
        if (*report_cmd) return run_report_command(report_opts, std::cout);
        if (*compare_cmd) return run_compare_command(compare, std::cout);
    } catch (const sim::scenario_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const sim::clock_config_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const harness::firmware_load_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const sim::quantity_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const sim::output_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const sim::report_format_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const harness::run::sweep_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const sim::vcd_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const std::exception& e) {
        report_error(std::string("internal error, a bug: please report it with the input: ") +
                     e.what());
        return exit_internal;
    }
    return exit_internal;
}

}  // namespace harness::cli
