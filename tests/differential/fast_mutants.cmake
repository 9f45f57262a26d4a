# Mutants of the fast timer model. Each is models/timer/timer_core.cpp with one snippet replaced,
# generated at build time into the build folder by make_fast_mutant.cmake, with the class renamed so
# that it links beside the real one; the production code carries no hook for them. The differential
# test must catch and shrink every one (differential_test.cpp, catches_fast_model_mutant).
#
# Per mutant: _rule, the rule of docs/timer-model.md it breaks; _from, code of timer_core.cpp that
# must appear there exactly once; _to, what replaces it. When timer_core.cpp changes so that a
# snippet is gone, the build stops with a message naming the mutant: rewrite the snippet so that the
# mutant breaks the same rule in the code as it is now, never drop it quietly.

set(fast_mutants
  clock_change_dropped
  skip_lands_one_step_late
  prescale_count_lost_in_skip
  compare_shadow_not_loaded
  period_shadow_not_loaded
)

# A clock change: the model keeps the cached time of its next event, computed on the old timeline.
set(fast_mutant_clock_change_dropped_rule
  "ticks after a timer clock change come at the new clock's times")
set(fast_mutant_clock_change_dropped_from [==[void timer_core::clock_changed(time_ps) {]==])
set(fast_mutant_clock_change_dropped_to [==[void timer_core::clock_changed(time_ps) {
    return;]==])

# Skipping: a skip that ends exactly on a step leaves the step for later, one tick late.
set(fast_mutant_skip_lands_one_step_late_rule
  "the counter steps when pcount + 1 reaches the prescale factor, also at the end of a skip")
set(fast_mutant_skip_lands_one_step_late_from [==[    if (m < d) {
        pcount_ += m;]==])
set(fast_mutant_skip_lands_one_step_late_to [==[    if (m <= d) {
        pcount_ += m;]==])

# Skipping: the prescaler count restarts at 0 after a skip instead of keeping the ticks since the
# last step.
set(fast_mutant_prescale_count_lost_in_skip_rule
  "the prescaler counts every tick, skipped ones too")
set(fast_mutant_prescale_count_lost_in_skip_from [==[    pcount_ = (m - d) % p;]==])
set(fast_mutant_prescale_count_lost_in_skip_to [==[    pcount_ = 0;]==])

# A reload event forgets a compare value written with preload on.
set(fast_mutant_compare_shadow_not_loaded_rule
  "a reload event loads a compare value written while its preload was on")
set(fast_mutant_compare_shadow_not_loaded_from
  [==[        if (ch_[i].waiting) ch_[i].compare = ch_[i].compare_shadow;]==])
set(fast_mutant_compare_shadow_not_loaded_to "")

# A reload event forgets a period written with preload on.
set(fast_mutant_period_shadow_not_loaded_rule
  "a reload event loads a period written while its preload was on")
set(fast_mutant_period_shadow_not_loaded_from [==[    if (period_waiting_) period_ = period_shadow_;]==])
set(fast_mutant_period_shadow_not_loaded_to "")
