// The firmware's log lines as an output file; see firmware_log.h.

#include "harness/run/firmware_log.h"

#include "sim/vcd_writer.h"  // sim::output_error

#include <cerrno>
#include <cstring>

namespace harness::run {

namespace {

constexpr sim::time_ps ps_per_ms = 1'000'000'000;

}  // namespace

firmware_log::firmware_log(std::string path) : path_(std::move(path)) {
    errno = 0;
    file_ = std::fopen(path_.c_str(), "wb");
    if (file_ == nullptr)
        throw sim::output_error("cannot create " + path_ + ": " +
                                std::strerror(errno != 0 ? errno : EIO));
}

firmware_log::~firmware_log() {
    if (file_ != nullptr) std::fclose(file_);
}

std::string firmware_log::stamp(sim::time_ps at) {
    char fraction[16];
    std::snprintf(fraction, sizeof fraction, "%09llu",
                  static_cast<unsigned long long>(at % ps_per_ms));
    return std::to_string(at / ps_per_ms) + "." + fraction + " ms";
}

std::string firmware_log::format(sim::time_ps at, std::string_view text) {
    if (!text.empty() && text.back() == '\n') text.remove_suffix(1);
    const std::string prefix = stamp(at);
    std::string out;
    for (;;) {
        const std::size_t end = text.find('\n');
        const std::string_view line = text.substr(0, end);
        out += prefix;
        if (!line.empty()) {
            out += "  ";
            out += line;
        }
        out += '\n';
        if (end == std::string_view::npos) break;
        text.remove_prefix(end + 1);
    }
    return out;
}

void firmware_log::write(sim::time_ps at, std::string_view text) {
    if (file_ == nullptr || error_ != 0) return;
    const std::string lines = format(at, text);
    errno = 0;
    if (std::fwrite(lines.data(), 1, lines.size(), file_) != lines.size()) {
        error_ = errno != 0 ? errno : EIO;
        return;
    }
    for (char c : lines) lines_ += c == '\n' ? 1 : 0;
}

void firmware_log::close() {
    if (file_ == nullptr) return;
    errno = 0;
    if (error_ == 0 && std::fflush(file_) != 0) error_ = errno != 0 ? errno : EIO;
    errno = 0;
    if (std::fclose(file_) != 0 && error_ == 0) error_ = errno != 0 ? errno : EIO;
    file_ = nullptr;
    if (error_ != 0)
        throw sim::output_error("cannot write " + path_ + ": " + std::strerror(error_));
}

}  // namespace harness::run
