#include "harness/testing/run_in_child.h"

#include <fcntl.h>
#include <sys/wait.h>
#include <unistd.h>
#include <cstdio>

namespace harness {

child_result run_in_child(const std::function<int()>& body, bool capture, bool quiet) {
    int pipe_fds[2] = {-1, -1};
    if (capture && pipe(pipe_fds) != 0) return {};
    std::fflush(stdout);
    std::fflush(stderr);
    const pid_t pid = fork();
    if (pid == 0) {
        if (capture) {
            dup2(pipe_fds[1], 1);
            dup2(pipe_fds[1], 2);
            close(pipe_fds[0]);
            close(pipe_fds[1]);
        } else if (quiet) {
            const int null_fd = open("/dev/null", O_WRONLY);
            dup2(null_fd, 1);
            dup2(null_fd, 2);
        }
        int code = 1;
        try {
            code = body();
        } catch (...) {
            code = 125;
        }
        std::fflush(stdout);
        std::fflush(stderr);
        _exit(code);
    }
    child_result r;
    if (capture) {
        close(pipe_fds[1]);
        char buf[4096];
        ssize_t n;
        while ((n = read(pipe_fds[0], buf, sizeof buf)) > 0)
            r.output.append(buf, static_cast<std::size_t>(n));
        close(pipe_fds[0]);
    }
    int status = 0;
    waitpid(pid, &status, 0);
    if (WIFEXITED(status)) r.exit_code = WEXITSTATUS(status);
    if (WIFSIGNALED(status)) r.signal = WTERMSIG(status);
    return r;
}

}  // namespace harness
