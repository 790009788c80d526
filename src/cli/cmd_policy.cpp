// overshoot policy --menu A,B,...: choosing the option every turn. Alone
// (fastest and surest policies), against a fixed option (--against) or
// against a second menu (--against-menu, a zero-sum game).
#include <fmt/format.h>

#include <memory>
#include <optional>

#include "chain/chain.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "policy/alone.hpp"
#include "policy/duel_policy.hpp"
#include "render/policy.hpp"
#include "render/svg.hpp"

namespace overshoot::cli {
namespace {

struct PolicyArgs {
    BoardFlags board;
    OutputFlags out;
    std::optional<std::string> menu;
    std::optional<std::string> against;
    std::optional<std::string> against_menu;
    bool exact = false;
    bool state_values = false;
    int map_distance = 0;
};

std::vector<Chain> chains_of(const Board& board, const std::vector<Option>& opts) {
    std::vector<Chain> out;
    for (const auto& o : opts) out.push_back(build_chain(board, o));
    return out;
}

void run(const PolicyArgs& a) {
    if (!a.menu) throw InputError("policy needs --menu SPEC,SPEC,... (the options piece A chooses from)");
    if (a.against && a.against_menu) throw InputError("give --against SPEC or --against-menu SPEC,..., not both");
    const std::string format = a.out.chosen();
    if (a.state_values && format != "json") throw InputError("--state-values goes into the JSON document: add --json");
    const int most = max_menu_options;
    Setup s = resolve_setup(a.board, list_words(*a.menu, "--menu"), 1, most);
    std::vector<Chain> menu = chains_of(s.board, s.options);
    if (!a.against && !a.against_menu) {
        if (a.board.order) throw InputError("--order applies to --against and --against-menu; a piece alone has no turn order");
        AlonePolicy r = solve_alone(menu, a.exact);
        render::AlonePolicyView view{&s.board, &s.options, &r};
        deliver(a.out, format == "svg"    ? render::svg::file(render::alone_policy_figure(view))
                       : format == "json" ? render::alone_policy_json(view).dump(2)
                                          : render::alone_policy_text(view));
        return;
    }
    std::vector<Option> against = a.against ? resolve_setup(a.board, {*a.against}, 1, 1).options
                                            : resolve_setup(a.board, list_words(*a.against_menu, "--against-menu"), 1, most).options;
    std::vector<Chain> other = chains_of(s.board, against);
    PolicyComparison r = compare_policies(menu, other, s.order, a.exact);
    render::DuelPolicyView view{&s.board, s.order, &s.options, &against, &r, a.state_values, a.map_distance};
    deliver(a.out, format == "svg"    ? render::svg::file(render::policy_figure(view))
                   : format == "json" ? render::duel_policy_json(view).dump(2)
                                      : render::duel_policy_text(view));
}

const Registration reg(33, [](CLI::App& app) {
    auto args = std::make_shared<PolicyArgs>();
    auto* cmd = app.add_subcommand("policy", "choosing the option every turn: optimal policies and what adaptivity is worth");
    add_board_flags(*cmd, args->board);
    add_output_flags(*cmd, args->out, {"text", "json", "svg"});
    cmd->add_option("--menu", args->menu, "options piece A chooses from each turn: SPEC,SPEC,... (specs or scenario names)")
        ->type_name("SPEC,...");
    cmd->add_option("--against", args->against, "a fixed option for piece B: A maximises P(A wins)")
        ->type_name("SPEC");
    cmd->add_option("--against-menu", args->against_menu,
                    "options piece B chooses from: a zero-sum game with payoff P(A wins) - P(B wins)")
        ->type_name("SPEC,...");
    cmd->add_flag("--exact", args->exact, "values and choices in exact fractions (docs/policy.md says where)");
    cmd->add_flag("--state-values", args->state_values,
                  "with --json: the goal's value at every state (A to move, and B to move for alternating orders)");
    cmd->add_option("--map-distance", args->map_distance,
                    "with --format svg: the map shows distances 1..D only, where choices differ (default 0: all)")
        ->check(whole_in(0, limits::max_length))
        ->type_name("D");
    cmd->callback([args] { run(*args); });
});

}  // namespace
}  // namespace overshoot::cli
