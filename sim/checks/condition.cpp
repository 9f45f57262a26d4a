// Recursive-descent compiler of `never` conditions; see condition.h.

#include "sim/checks/condition.h"

#include <algorithm>

namespace sim {

namespace {

bool is_name_start(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '_'; }
bool is_name_char(char c) {
    return is_name_start(c) || (c >= '0' && c <= '9') || c == '.' || c == '[' || c == ']';
}

}  // namespace

// Builds a condition's program; one instance per parse.
class condition_parser {
public:
    explicit condition_parser(std::string_view text) : text_(text) {}

    condition run() {
        skip_space();
        if (pos_ == text_.size()) fail("expected a condition such as \"a and b\", got nothing");
        parse_or();
        skip_space();
        if (pos_ != text_.size())
            fail("expected \"and\", \"or\" or the end, got \"" + rest() + "\"");
        return std::move(out_);
    }

private:
    using op = condition::op;
    using op_code = condition::op_code;

    void parse_or() {
        parse_and();
        while (take_word("or")) {
            parse_and();
            emit(op_code::either, 0);
        }
    }
    void parse_and() {
        parse_not();
        while (take_word("and")) {
            parse_not();
            emit(op_code::both, 0);
        }
    }
    void parse_not() {
        if (take_word("not")) {
            parse_not();
            emit(op_code::negate, 0);
            return;
        }
        parse_primary();
    }
    void parse_primary() {
        skip_space();
        if (pos_ < text_.size() && text_[pos_] == '(') {
            ++pos_;
            if (++nesting_ > 32) fail("parentheses nest deeper than 32 levels");
            parse_or();
            skip_space();
            if (pos_ >= text_.size() || text_[pos_] != ')') fail("expected \")\"");
            ++pos_;
            --nesting_;
            return;
        }
        if (pos_ >= text_.size() || !is_name_start(text_[pos_])) {
            fail(pos_ >= text_.size()
                     ? "expected a signal name, \"not\" or \"(\" at the end"
                     : "expected a signal name, \"not\" or \"(\", got \"" + rest() + "\"");
        }
        const std::size_t start = pos_;
        while (pos_ < text_.size() && is_name_char(text_[pos_])) ++pos_;
        const std::string name(text_.substr(start, pos_ - start));
        if (name == "and" || name == "or" || name == "not") {
            pos_ = start;
            fail("expected a signal name, got the keyword \"" + name + "\"");
        }
        auto& names = out_.signals_;
        const auto it = std::find(names.begin(), names.end(), name);
        const auto slot = static_cast<std::uint32_t>(it - names.begin());
        if (it == names.end()) names.push_back(name);
        emit(op_code::push, slot);
    }

    // Appends an operation and tracks the evaluation stack depth (the bit stack holds 64).
    void emit(op_code code, std::uint32_t slot) {
        out_.program_.push_back(op{code, slot});
        if (code == op_code::push) {
            if (++depth_ > 64) fail("condition too deeply nested (more than 64 pending operands)");
        } else if (code != op_code::negate) {
            --depth_;
        }
    }
    void skip_space() {
        while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\t')) ++pos_;
    }
    // Consumes keyword `w` when it stands next as a whole word.
    bool take_word(std::string_view w) {
        skip_space();
        if (text_.substr(pos_, w.size()) != w) return false;
        const std::size_t after = pos_ + w.size();
        if (after < text_.size() && is_name_char(text_[after])) return false;
        pos_ = after;
        return true;
    }
    std::string rest() const { return std::string(text_.substr(pos_, 20)); }
    [[noreturn]] void fail(const std::string& what) const {
        throw condition_error("column " + std::to_string(pos_ + 1) + ": " + what);
    }

    std::string_view text_;
    std::size_t pos_ = 0;
    unsigned nesting_ = 0;
    unsigned depth_ = 0;
    condition out_;
};

condition condition::parse(std::string_view text) { return condition_parser(text).run(); }

}  // namespace sim
