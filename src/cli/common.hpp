#pragma once
// Board flags shared by every analysis command, and their merge with a scenario.
#include <CLI/CLI.hpp>
#include <optional>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "core/scenario.hpp"

namespace overshoot::cli {

struct BoardFlags {
    std::optional<int> length;
    std::optional<std::string> overshoot;
    std::vector<std::string> jumps;
    std::optional<std::string> order;
    std::optional<std::string> scenario;
    bool json = false;
    std::optional<long long> memory_mib;
    CLI::Option* jump_option = nullptr;
};

void add_board_flags(CLI::App& cmd, BoardFlags& flags, bool with_order = true);

struct Setup {
    Board board;
    Order order = Order::simultaneous;
    std::vector<Option> options;
};

// Merges scenario and flags (flags win; --jump replaces the scenario's list),
// resolves each positional word as a scenario name or a spec, and validates.
// With no positional words, every option of the scenario is used.
Setup resolve_setup(const BoardFlags& flags, const std::vector<std::string>& words, std::size_t min_options,
                    std::size_t max_options);

// The option words of a command that takes them as extras, verbatim (CLI11
// would split a bracketed die like [1,2,6] given as a positional); a word that
// looks like a flag is refused as unknown.
std::vector<std::string> option_words(const CLI::App& cmd);

// Prints text or a JSON document (with a final newline) to stdout.
void emit(const std::string& text);

}  // namespace overshoot::cli
