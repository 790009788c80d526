#pragma once
// File output that writes through to what the path names and never leaves a
// half-written file behind.
#include <string>
#include <string_view>

namespace overshoot {

// Writes `content` to the file `path` names. A regular file (or a symbolic link
// to one, followed to its final target, or a name not yet taken) is replaced
// atomically: a temporary file in the target's folder, fsync, rename over the
// target, fsync of the folder; a link stays a link and its target gets the
// bytes. A device, pipe or other non-regular file is written directly, never
// replaced. Every write and close is checked: a failure throws InputError
// naming the path, and no temporary file is left.
void write_atomically(const std::string& path, std::string_view content);

// The final target of `path` with every symbolic link followed (relative link
// texts resolve against the link's folder); `path` itself when it is no link.
std::string link_target(const std::string& path);

// The whole content of a file, as bytes; throws InputError "PATH: cannot be
// read" when it cannot be opened.
std::string read_file(const std::string& path);

// Writes all of `content` to an open descriptor; false (errno set) on failure.
bool write_all(int fd, std::string_view content);

}  // namespace overshoot
