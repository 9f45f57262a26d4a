#pragma once
// Test helpers for tests that write files: a fresh path in a folder of the test process's own
// under the system's temporary folder, and a whole file read back as bytes.

#include <unistd.h>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace tickbench::test_support {

// `name` in the folder "<tmp>/<prefix>_<pid>", created if missing.
inline std::string temp_path(const std::string& prefix, const std::string& name) {
    const std::filesystem::path dir =
        std::filesystem::temp_directory_path() / (prefix + "_" + std::to_string(::getpid()));
    std::filesystem::create_directories(dir);
    return (dir / name).string();
}

// The whole file at `path` (empty when it cannot be read).
inline std::string read_whole_file(const std::string& path) {
    std::ifstream f(path, std::ios::binary);
    std::ostringstream s;
    s << f.rdbuf();
    return s.str();
}

}  // namespace tickbench::test_support
