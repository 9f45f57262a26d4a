// Scenario keys replaced by dotted path before the loader reads them
// (harness/run/scenario_key_overrides.h).

#include "harness/run/scenario_key_overrides.h"

#include "sim/scenario_error.h"

#include <gtest/gtest.h>

using harness::run::apply_key_overrides;

namespace {

toml::table demo() {
    return toml::parse(R"(
[clocks.xtal]
kind = "crystal"
frequency = "12 MHz"

[firmware.parameters]
reads = "64"

[run]
duration = "50 us"
)");
}

std::string error_of(toml::table& t, const std::string& path, const std::string& value) {
    try {
        apply_key_overrides(t, {{path, value}}, "demo.toml");
    } catch (const sim::scenario_error& e) {
        return e.what();
    }
    return "";
}

}  // namespace

TEST(scenario_key_overrides_test, replaces_a_value_keeping_a_string_a_string) {
    toml::table t = demo();
    apply_key_overrides(t,
                        {{"clocks.xtal.frequency", "7.9 MHz"}, {"firmware.parameters.reads", "32"}},
                        "demo.toml");
    EXPECT_EQ(t["clocks"]["xtal"]["frequency"].value_exact<std::string>(), "7.9 MHz");
    EXPECT_EQ(t["firmware"]["parameters"]["reads"].value_exact<std::string>(), "32");
}

TEST(scenario_key_overrides_test, a_new_key_takes_the_type_its_text_reads_as) {
    toml::table t = demo();
    apply_key_overrides(t,
                        {{"clocks.xtal.offset", "5"},
                         {"clocks.xtal.enabled", "true"},
                         {"clocks.xtal.level", "1.5"},
                         {"clocks.xtal.note", "slow start"},
                         {"clocks.xtal.quoted", "\"7\""}},
                        "demo.toml");
    EXPECT_EQ(t["clocks"]["xtal"]["offset"].value_exact<std::int64_t>(), 5);
    EXPECT_EQ(t["clocks"]["xtal"]["enabled"].value_exact<bool>(), true);
    EXPECT_EQ(t["clocks"]["xtal"]["level"].value_exact<double>(), 1.5);
    EXPECT_EQ(t["clocks"]["xtal"]["note"].value_exact<std::string>(), "slow start");
    EXPECT_EQ(t["clocks"]["xtal"]["quoted"].value_exact<std::string>(), "7");
}

TEST(scenario_key_overrides_test, names_the_path_and_what_exists) {
    toml::table t = demo();
    EXPECT_EQ(error_of(t, "clocks.xtl.frequency", "8 MHz"),
              "demo.toml: clocks.xtl.frequency: [clocks] has no table \"xtl\" (the sweep axis "
              "clocks.xtl.frequency); keys in [clocks]: xtal");
    EXPECT_EQ(error_of(t, "timers.pwm.interrupt-delay", "1"),
              "demo.toml: timers.pwm.interrupt-delay: the scenario has no table \"timers\" (the "
              "sweep axis timers.pwm.interrupt-delay); keys in the scenario: clocks, firmware, "
              "run");
    EXPECT_EQ(error_of(t, "run.duration.x", "1"),
              "demo.toml: run.duration.x: \"duration\" in [run] is not a table (the sweep axis "
              "run.duration.x); keys in [run]: duration");
    EXPECT_EQ(error_of(t, "clocks.xtal", "1"),
              "demo.toml: clocks.xtal: is a table, not a value (the sweep axis clocks.xtal); keys "
              "in it: frequency, kind");
}
