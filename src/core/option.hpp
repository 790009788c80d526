#pragma once
// A movement option: an exact distribution of the number of squares moved per
// turn, kept as integer weights over one common denominator.
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace overshoot {

struct Option {
    std::string name;                    // as shown to the user
    std::string spec;                    // the spec as typed
    std::vector<std::uint64_t> weight;   // weight[m] = ways to move m squares
    std::uint64_t denominator = 1;       // sum of weights (gcd-reduced)

    int max_move() const { return static_cast<int>(weight.size()) - 1; }
    int min_move() const;
    long double probability(int move) const;
    double mean() const;
};

// Parses the spec grammar of docs/options.md (NdS, [faces], N[faces],
// {move:weight,...}, constants, sums with '+'). Throws InputError naming the
// position of the problem.
Option parse_option(std::string_view spec);

// Same, with a display name other than the spec.
Option parse_option(std::string_view spec, std::string name);

// The index of the first name that repeats an earlier one, if any.
std::optional<std::size_t> first_repeated_name(const std::vector<std::string>& names);
// Throws InputError "option name 'X' appears twice; ..." for the first repeat.
void require_distinct_names(const std::vector<std::string>& names);
void require_distinct_names(const std::vector<Option>& options);

// Refuses (InputError) a name or spec holding a control character (bytes
// 0x00-0x1f and 0x7f, and the C1 controls U+0080-U+009F): printed on a
// terminal it could move the cursor or clear the screen. `what` names it in
// the message ("option name", "spec"), which shows the text escaped.
void require_printable(const std::string& text, const char* what);
// The text with every such control character written as \xNN.
std::string escape_controls(const std::string& text);

}  // namespace overshoot
