#pragma once
// Subcommands register themselves: each src/cli/cmd_*.cpp defines one static
// Registration, so adding a command never touches main.cpp.
#include <CLI/CLI.hpp>
#include <functional>
#include <string>
#include <vector>

namespace overshoot::cli {

// `setup` adds the subcommand to the app and attaches its callback.
struct CommandEntry {
    int order;  // position in --help
    std::function<void(CLI::App&)> setup;
};

std::vector<CommandEntry>& commands();

struct Registration {
    Registration(int order, std::function<void(CLI::App&)> setup) { commands().push_back({order, std::move(setup)}); }
};

// Exit status of the command that ran (set by callbacks; 0 by default).
int& exit_status();

}  // namespace overshoot::cli
