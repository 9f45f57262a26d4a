// Whole-file writes for the reports; see output_file.h.

#include "sim/report/detail/output_file.h"

#include "sim/vcd_writer.h"  // sim::output_error

#include <cerrno>
#include <cstdio>
#include <cstring>

namespace sim::detail {

namespace {

[[noreturn]] void fail(const char* what, const std::string& path, int err) {
    throw output_error(std::string("cannot ") + what + " " + path + ": " + std::strerror(err));
}

}  // namespace

void write_output_file(const std::string& path, const std::string& text) {
    errno = 0;
    std::FILE* f = std::fopen(path.c_str(), "wb");
    if (f == nullptr) fail("create", path, errno != 0 ? errno : EIO);
    errno = 0;
    const std::size_t written = text.empty() ? 0 : std::fwrite(text.data(), 1, text.size(), f);
    if (written != text.size() || std::fflush(f) != 0) {
        const int err = errno != 0 ? errno : EIO;
        std::fclose(f);
        fail("write", path, err);
    }
    errno = 0;
    if (std::fclose(f) != 0) fail("close", path, errno != 0 ? errno : EIO);
}

}  // namespace sim::detail
