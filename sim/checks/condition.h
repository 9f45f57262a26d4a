#pragma once
// The tiny level language of `never` checks: signal names combined with and, or, not and
// parentheses ("bridge.high and bridge.low", "not (a or b)"). Precedence: not, then and, then or.
//
// A condition is compiled once into a postfix program over signal slots and evaluated on a
// 64-entry bit stack, so evaluating it while the simulation runs allocates nothing.

#include <cstdint>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace sim {

// A condition text that cannot be read; the message gives the column and what was expected.
class condition_error : public std::invalid_argument {
public:
    using std::invalid_argument::invalid_argument;
};

class condition {
public:
    // Compiles `text`; throws condition_error (with a 1-based column) when it is not a condition.
    static condition parse(std::string_view text);

    // The distinct signal names, in order of first appearance; slot i is signals()[i].
    const std::vector<std::string>& signals() const { return signals_; }
    // The condition's value when slot i has level level_of(i).
    template <class level_fn>
    bool eval(level_fn level_of) const {
        std::uint64_t stack = 0;  // bit 0 is the top
        for (const op& o : program_) {
            switch (o.code) {
                case op_code::push:
                    stack = (stack << 1) | (level_of(o.slot) ? 1u : 0u);
                    break;
                case op_code::negate:
                    stack ^= 1u;
                    break;
                case op_code::both:
                    stack = (stack >> 1) & (stack | ~std::uint64_t{1});
                    break;
                case op_code::either:
                    stack = (stack >> 1) | (stack & 1u);
                    break;
            }
        }
        return (stack & 1u) != 0;
    }

private:
    enum class op_code : std::uint8_t { push, negate, both, either };
    struct op {
        op_code code;
        std::uint32_t slot;
    };
    friend class condition_parser;
    std::vector<std::string> signals_;
    std::vector<op> program_;
};

}  // namespace sim
