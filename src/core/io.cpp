#include "core/io.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/error.hpp"

namespace overshoot {

namespace {

std::string reason(int err) { return std::strerror(err); }

[[noreturn]] void fail(const std::string& path, const char* what, int err) {
    throw InputError(fmt::format("{}: {} ({})", path, what, reason(err)));
}

// The folder holding `path` ("." for a bare name).
std::string folder_of(const std::string& path) {
    const std::filesystem::path p(path);
    const auto parent = p.parent_path();
    return parent.empty() ? std::string(".") : parent.string();
}

// Direct write to a device, pipe or socket: replacing it would destroy it.
void write_direct(const std::string& path, std::string_view content) {
    const int fd = ::open(path.c_str(), O_WRONLY | O_CLOEXEC | O_NOCTTY);
    if (fd < 0) fail(path, "cannot open for writing", errno);
    if (!write_all(fd, content)) {
        const int err = errno;
        ::close(fd);
        fail(path, "write failed", err);
    }
    if (::close(fd) != 0) fail(path, "write failed on close", errno);
}

}  // namespace

bool write_all(int fd, std::string_view content) {
    const char* p = content.data();
    std::size_t left = content.size();
    while (left > 0) {
        const ssize_t n = ::write(fd, p, left);
        if (n < 0) {
            if (errno == EINTR) continue;
            return false;
        }
        p += n;
        left -= static_cast<std::size_t>(n);
    }
    return true;
}

std::string link_target(const std::string& path) {
    std::string cur = path;
    for (int hops = 0; hops < 40; ++hops) {  // 40: the kernel's own limit on followed links
        struct stat st {};
        if (::lstat(cur.c_str(), &st) != 0 || !S_ISLNK(st.st_mode)) return cur;
        std::string text(static_cast<std::size_t>(st.st_size > 0 ? st.st_size : 4096) + 1, '\0');
        const ssize_t n = ::readlink(cur.c_str(), text.data(), text.size());
        if (n < 0) fail(path, "cannot read the symbolic link", errno);
        text.resize(static_cast<std::size_t>(n));
        cur = (!text.empty() && text[0] == '/') ? text : (std::filesystem::path(folder_of(cur)) / text).string();
    }
    fail(path, "cannot follow the symbolic link", ELOOP);
}

void write_atomically(const std::string& path, std::string_view content) {
    if (path.empty()) throw InputError("an output file name is empty");
    // stat follows links in the kernel, including /proc's links to pipes.
    struct stat st {};
    const bool exists = ::stat(path.c_str(), &st) == 0;
    if (exists && S_ISDIR(st.st_mode)) fail(path, "cannot write", EISDIR);
    if (exists && !S_ISREG(st.st_mode)) {
        write_direct(path, content);
        return;
    }
    const std::string target = link_target(path);
    const std::string dir = folder_of(target);
    std::string tmp;
    int fd = -1;
    for (int attempt = 0; fd < 0 && attempt < 100; ++attempt) {
        tmp = fmt::format("{}.tmp.{}.{}", target, static_cast<long>(::getpid()), attempt);
        fd = ::open(tmp.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0666);
        if (fd < 0 && errno != EEXIST) fail(path, "cannot write", errno);
    }
    if (fd < 0) fail(path, "cannot write", EEXIST);
    auto give_up = [&](const char* what, int err) {
        if (fd >= 0) ::close(fd);
        ::unlink(tmp.c_str());
        fail(path, what, err);
    };
    // A replaced file keeps its permissions.
    if (exists && ::fchmod(fd, st.st_mode & 07777) != 0) give_up("cannot keep the file's permissions", errno);
    if (!write_all(fd, content)) give_up("write failed", errno);
    if (::fsync(fd) != 0) give_up("cannot flush to disk", errno);
    const int closed = ::close(fd);
    fd = -1;
    if (closed != 0) give_up("write failed on close", errno);
    if (std::rename(tmp.c_str(), target.c_str()) != 0) give_up("cannot rename into place", errno);
    // The rename itself is durable only once the folder is flushed.
    const int dfd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (dfd < 0) fail(path, "cannot open its folder to flush it", errno);
    const bool synced = ::fsync(dfd) == 0 || errno == EINVAL;  // EINVAL: the file system cannot sync folders
    const int err = errno;
    ::close(dfd);
    if (!synced) fail(path, "cannot flush its folder to disk", err);
}

std::string read_file(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError(fmt::format("{}: cannot be read", path));
    std::stringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

}  // namespace overshoot
