#pragma once
// The report: one self-contained HTML file (inline SVG and CSS, no script,
// nothing fetched) gathering the rules, profiles, win matrix, digraph, cycles,
// counters, equilibrium mix and, when asked for, a sweep, a race of several
// pieces, a choice game and balancing results.
#include <optional>
#include <string>
#include <vector>

#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "race/choice.hpp"
#include "race/several_pieces.hpp"
#include "race/balance.hpp"
#include "render/policy.hpp"
#include "search/search.hpp"
#include "sweep/sweep.hpp"
#include "tournament/tournament.hpp"

namespace overshoot::render {

struct ReportInput {
    const Board* board = nullptr;
    Order order = Order::simultaneous;
    const std::vector<Option>* options = nullptr;
    std::string source;                     // where the setup came from (scenario path or "command line")
    std::vector<Profile> profiles;          // one per option
    std::vector<Distribution> distributions;  // one per option
    const Tournament* tournament = nullptr;
    const SweepResult* sweep = nullptr;     // when a length range was given
    // Sections of races of several pieces (each optional).
    RaceOrder race_order = RaceOrder::simultaneous;
    const RaceResult* race = nullptr;       // one piece per option, all from square 0
    const ChoiceResult* choice = nullptr;
    const HeadStartResult* head_starts = nullptr;
    const LengthsResult* fair_lengths = nullptr;
    // Choosing the option every turn (the report's options are A's menu).
    const DuelPolicyView* policy = nullptr;
    // A board search for these options on this board (report --search-target).
    const SearchResult* search = nullptr;
    const SearchSpec* search_spec = nullptr;
};

std::string report_html(const ReportInput& in);

}  // namespace overshoot::render
