#include "core/io.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "core/error.hpp"

namespace overshoot {

void write_atomically(const std::string& path, std::string_view content) {
    std::string tmp = fmt::format("{}.tmp.{}", path, static_cast<long>(::getpid()));
    int fd = ::open(tmp.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
    if (fd < 0) throw InputError(fmt::format("{}: cannot write ({})", path, std::strerror(errno)));
    const char* p = content.data();
    std::size_t left = content.size();
    while (left > 0) {
        ssize_t n = ::write(fd, p, left);
        if (n < 0) {
            if (errno == EINTR) continue;
            int err = errno;
            ::close(fd);
            ::unlink(tmp.c_str());
            throw InputError(fmt::format("{}: write failed ({})", path, std::strerror(err)));
        }
        p += n;
        left -= static_cast<std::size_t>(n);
    }
    if (::fsync(fd) != 0 || ::close(fd) != 0) {
        ::unlink(tmp.c_str());
        throw InputError(fmt::format("{}: cannot flush to disk", path));
    }
    if (std::rename(tmp.c_str(), path.c_str()) != 0) {
        int err = errno;
        ::unlink(tmp.c_str());
        throw InputError(fmt::format("{}: cannot rename into place ({})", path, std::strerror(err)));
    }
}

}  // namespace overshoot
