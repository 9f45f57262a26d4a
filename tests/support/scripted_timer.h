#pragma once
// A stand-in timer for wiring tests: it records every call with its time (inputs set, chained
// pulses, advances, accesses), and plays a script of output reports (pin changes, trigger pulses)
// to its observers as it is advanced, announcing each as its next event. So a test can drive a
// producer and a consumer without a timer model and check what reached whom, and when.

#include "models/timer/timer_types.h"

#include <cstdint>
#include <deque>
#include <stdexcept>
#include <string>
#include <vector>

namespace tickbench_test {

class scripted_timer : public models::timer_core_if {
public:
    // One scripted report: pin `pin` takes `level`, or (pin < 0) a trigger pulse, at `at`.
    struct report {
        models::time_ps at;
        int pin;
        bool level;
    };

    // What the timer was asked, in order: "advance 5", "input 0=1 @7", "pulse @9", "initial 6=1".
    std::vector<std::string> calls;
    std::deque<report> script;
    std::vector<models::timer_observer*> observers;
    models::time_ps reached = 0;

    void advance_to(models::time_ps t) override {
        if (t < reached) return;  // already there, as a timer model does
        play(t);
        calls.push_back("advance " + std::to_string(t));
    }
    void write(models::timer_field, unsigned, std::uint32_t, models::time_ps t) override {
        play(t);
        calls.push_back("write @" + std::to_string(t));
    }
    std::uint32_t read(models::timer_field, unsigned, models::time_ps t) override {
        play(t);
        calls.push_back("read @" + std::to_string(t));
        return 0;
    }
    void clear_flags(std::uint32_t, models::time_ps t) override { play(t); }
    void set_fault_input(bool level, models::time_ps t) override {
        play(t);
        calls.push_back(std::string("fault=") + (level ? "1" : "0") + " @" + std::to_string(t));
    }
    void set_input(unsigned input, bool level, models::time_ps t) override {
        play(t);
        calls.push_back("input " + std::to_string(input) + "=" + (level ? "1" : "0") + " @" +
                        std::to_string(t));
    }
    void set_initial_input(unsigned input, bool level) override {
        calls.push_back("initial " + std::to_string(input) + "=" + (level ? "1" : "0"));
    }
    void chained_pulse(models::time_ps t) override {
        play(t);
        calls.push_back("pulse @" + std::to_string(t));
    }
    bool next_event(models::time_ps& at) const override {
        if (script.empty()) return false;
        at = script.front().at;
        return true;
    }
    void clock_changed(models::time_ps) override {}

private:
    // Reports every scripted change at or before t; time never goes back.
    void play(models::time_ps t) {
        if (t < reached) throw std::logic_error("scripted_timer: time went back");
        reached = t;
        while (!script.empty() && script.front().at <= t) {
            const report r = script.front();
            script.pop_front();
            for (models::timer_observer* o : observers) {
                if (r.pin < 0)
                    o->on_trigger(r.at);
                else
                    o->on_pin(static_cast<unsigned>(r.pin), r.level, r.at);
            }
        }
    }
};

}  // namespace tickbench_test
