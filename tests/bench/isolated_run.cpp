#include "tests/bench/isolated_run.h"

#include <sys/wait.h>
#include <unistd.h>
#include <cstdio>
#include <stdexcept>
#include <string>

namespace bench {

double run_isolated(const std::function<double()>& body) {
    int fds[2];
    if (pipe(fds) != 0) throw std::runtime_error("pipe failed");
    std::fflush(stdout);
    std::fflush(stderr);
    const pid_t pid = fork();
    if (pid < 0) throw std::runtime_error("fork failed");
    if (pid == 0) {
        close(fds[0]);
        double v = -1;
        int code = 0;
        try {
            v = body();
        } catch (const std::exception& e) {
            std::fprintf(stderr, "tickbench-bench: %s\n", e.what());
            code = 1;
        }
        if (write(fds[1], &v, sizeof v) != static_cast<ssize_t>(sizeof v)) code = 1;
        close(fds[1]);
        _exit(code);
    }
    close(fds[1]);
    double v = 0;
    const ssize_t n = read(fds[0], &v, sizeof v);
    close(fds[0]);
    int status = 0;
    waitpid(pid, &status, 0);
    if (n != static_cast<ssize_t>(sizeof v) || !WIFEXITED(status) || WEXITSTATUS(status) != 0)
        throw std::runtime_error("a measurement's child process failed (status " +
                                 std::to_string(status) + ")");
    return v;
}

}  // namespace bench
