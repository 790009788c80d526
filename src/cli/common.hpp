#pragma once
// Flags shared by every command: the board flags and their merge with a
// scenario, the output flags (one model for every command), the usage line.
#include <CLI/CLI.hpp>
#include <optional>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "core/scenario.hpp"
#include "core/setup.hpp"

namespace overshoot::cli {

struct BoardFlags {
    std::optional<int> length;
    std::optional<std::string> overshoot;
    std::vector<std::string> jumps;
    std::optional<std::string> order;
    std::optional<std::string> scenario;
    std::optional<long long> memory_mib;
    CLI::Option* jump_option = nullptr;
    std::vector<std::string> head_starts;  // NAME:SQUARE each
    CLI::Option* head_start_option = nullptr;
    bool head_starts_allowed = false;  // set by the commands whose engines honour them
};

void add_board_flags(CLI::App& cmd, BoardFlags& flags, bool with_order = true);

// Sets the memory cap from --memory-limit, then merges scenario and flags
// (core/setup.hpp: flags win; --jump replaces the scenario's list). With no
// positional words, every option of the scenario is used.
Setup resolve_setup(const BoardFlags& flags, const std::vector<std::string>& words, std::size_t min_options,
                    std::size_t max_options);

// The option words of a command that takes them as extras, verbatim (CLI11
// would split a bracketed die like [1,2,6] given as a positional); a word that
// looks like a flag is refused as unknown.
std::vector<std::string> option_words(const CLI::App& cmd);

// Where and in what format a command's result goes, the same on every
// command: -o/--output FILE ("-" or none: stdout) and --format NAME from the
// formats the command offers (the first is the default); --json and --csv are
// short for --format json and --format csv where those are offered.
struct OutputFlags {
    std::vector<std::string> formats;
    std::optional<std::string> output;
    std::optional<std::string> format;
    bool json = false, csv = false;
    // The format asked for (the flags exclude each other, so at most one is set).
    std::string chosen() const;
};
void add_output_flags(CLI::App& cmd, OutputFlags& flags, std::vector<std::string> formats);

// Writes the result (with a final newline) where the output flags say: a file
// through write_atomically, else stdout, checked.
void deliver(const OutputFlags& flags, const std::string& text);

// Words of a comma-separated list of option specs or names (--menu); commas
// inside brackets or braces belong to a spec ("[1,2,6],2d6" is two words).
// `flag` names the flag in messages.
std::vector<std::string> list_words(const std::string& text, const char* flag);

// Prints to stdout and checks the write: a failure throws InputError.
void emit(const std::string& text);

// The positionals of a command for its usage line ("A B", "SPEC...") and a
// sentence saying what they are; shown by --help.
void set_usage(CLI::App& cmd, std::string positionals, std::string meaning);
struct Usage {
    std::string positionals, meaning;
};
const Usage* usage_of(const CLI::App* cmd);

// Words the option words of most commands are: specs or scenario names.
inline constexpr const char* option_words_meaning =
    "options: specs such as 1d6, 2d6, [1,2,6] or {1:3,4:1} (docs/options.md), or option names from --scenario "
    "(none: every option of the scenario)";

}  // namespace overshoot::cli
