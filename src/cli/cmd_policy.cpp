// overshoot policy --menu A,B,...: choosing the option every turn. Alone
// (fastest and surest policies), against a fixed option (--against) or
// against a second menu (--against-menu, a zero-sum game).
#include <fmt/format.h>

#include <memory>
#include <optional>

#include "chain/chain.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "policy/alone.hpp"
#include "policy/duel_policy.hpp"
#include "render/policy.hpp"
#include "render/svg.hpp"

namespace overshoot::cli {
namespace {

struct PolicyArgs {
    BoardFlags board;
    std::optional<std::string> menu;
    std::optional<std::string> against;
    std::optional<std::string> against_menu;
    std::optional<std::string> svg;
    bool exact = false;
    bool state_values = false;
};

// Words of a comma-separated list of option specs or names; commas inside
// brackets or braces belong to a spec ("[1,2,6],2d6" is two words).
std::vector<std::string> list_words(const std::string& text, const char* flag) {
    std::vector<std::string> out;
    std::string cur;
    int depth = 0;
    for (char ch : text) {
        if (ch == '[' || ch == '{') ++depth;
        if (ch == ']' || ch == '}') --depth;
        if (depth < 0) throw InputError(fmt::format("{} '{}': a closing bracket without its opening one", flag, text));
        if (ch == ',' && depth == 0) {
            out.push_back(cur);
            cur.clear();
            continue;
        }
        cur += ch;
    }
    if (depth != 0) throw InputError(fmt::format("{} '{}': a bracket is not closed", flag, text));
    out.push_back(cur);
    for (const auto& w : out)
        if (w.find_first_not_of(" \t") == std::string::npos)
            throw InputError(fmt::format("{} '{}': an empty option in the list", flag, text));
    return out;
}

std::vector<Chain> chains_of(const Board& board, const std::vector<Option>& opts) {
    std::vector<Chain> out;
    for (const auto& o : opts) out.push_back(build_chain(board, o));
    return out;
}

void run(const PolicyArgs& a) {
    if (!a.menu) throw InputError("policy needs --menu SPEC,SPEC,... (the options piece A chooses from)");
    if (a.against && a.against_menu) throw InputError("give --against SPEC or --against-menu SPEC,..., not both");
    const int most = max_menu_options;
    Setup s = resolve_setup(a.board, list_words(*a.menu, "--menu"), 1, most);
    if (a.svg && a.svg->empty()) throw InputError("--svg needs a file name");
    std::vector<Chain> menu = chains_of(s.board, s.options);
    if (!a.against && !a.against_menu) {
        if (a.board.order) throw InputError("--order applies to --against and --against-menu; a piece alone has no turn order");
        AlonePolicy r = solve_alone(menu, a.exact);
        render::AlonePolicyView view{&s.board, &s.options, &r};
        if (a.svg) write_atomically(*a.svg, render::svg::file(render::alone_policy_figure(view)));
        emit(a.board.json ? render::alone_policy_json(view).dump(2) : render::alone_policy_text(view));
        return;
    }
    std::vector<Option> against;
    if (a.against) {
        Setup b = resolve_setup(a.board, {*a.against}, 1, 1);
        against = b.options;
    } else {
        Setup b = resolve_setup(a.board, list_words(*a.against_menu, "--against-menu"), 1, most);
        against = b.options;
    }
    std::vector<Chain> other = chains_of(s.board, against);
    PolicyComparison r = compare_policies(menu, other, s.order, a.exact);
    render::DuelPolicyView view{&s.board, s.order, &s.options, &against, &r, a.state_values};
    if (a.svg) write_atomically(*a.svg, render::svg::file(render::policy_figure(view)));
    emit(a.board.json ? render::duel_policy_json(view).dump(2) : render::duel_policy_text(view));
}

const Registration reg(33, [](CLI::App& app) {
    auto args = std::make_shared<PolicyArgs>();
    auto* cmd = app.add_subcommand("policy", "choosing the option every turn: optimal policies and what adaptivity is worth");
    add_board_flags(*cmd, args->board);
    cmd->add_option("--menu", args->menu, "options piece A chooses from each turn: SPEC,SPEC,... (specs or scenario names)");
    cmd->add_option("--against", args->against, "a fixed option for piece B: A maximises P(A wins)");
    cmd->add_option("--against-menu", args->against_menu,
                    "options piece B chooses from: a zero-sum game with payoff P(A wins) - P(B wins)");
    cmd->add_flag("--exact", args->exact, "values and choices in exact fractions (docs/policy.md says where)");
    cmd->add_flag("--state-values", args->state_values,
                  "with --json: the goal's value at every state (A to move, and B to move for alternating orders)");
    cmd->add_option("--svg", args->svg, "also write the policy map as an SVG figure to FILE");
    cmd->callback([args] { run(*args); });
});

}  // namespace
}  // namespace overshoot::cli
