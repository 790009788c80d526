// overshoot choose SPEC...: players pick options in turn, each seeing the
// earlier picks; solved by backward induction.
#include <fmt/format.h>

#include <memory>

#include "chain/chain.hpp"
#include "cli/common.hpp"
#include "cli/race_flags.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "race/choice.hpp"
#include "render/several_pieces.hpp"

namespace overshoot::cli {
namespace {

struct ChooseArgs {
    BoardFlags board;
    std::vector<std::string> specs;
    std::optional<std::string> order;
    OutputFlags out;
    int players = 2;
    bool distinct = false;
};

void run(const ChooseArgs& a) {
    Setup s = resolve_setup(a.board, a.specs, 1, 64);
    const RaceOrder order = race_order_of(a.order, a.board);
    std::vector<Chain> chains;
    for (const auto& o : s.options) chains.push_back(build_chain(s.board, o));
    std::vector<const Chain*> ptr;
    for (const auto& c : chains) ptr.push_back(&c);
    RaceCache cache(s.board, ptr, order);
    ChoiceResult r = solve_choice(cache, static_cast<int>(s.options.size()), a.players, a.distinct);
    render::ChoiceView view{&s.board, order, &s.options, &r};
    deliver(a.out, a.out.chosen() == "json" ? render::choice_json(view).dump(2) : render::choice_text(view));
}

const Registration reg(31, [](CLI::App& app) {
    auto args = std::make_shared<ChooseArgs>();
    auto* cmd = app.add_subcommand(
        "choose", "players pick options in turn, each seeing earlier picks: best picks by backward induction");
    // Option words are taken verbatim from the extras: CLI11 would split a
    // bracketed die such as "[0,2,3]" given to a positional list.
    cmd->allow_extras();
    set_usage(*cmd, "SPEC...", option_words_meaning);
    add_board_flags(*cmd, args->board, false);
    add_output_flags(*cmd, args->out, {"text", "json"});
    cmd->add_option("--order", args->order, "race order: simultaneous or seated (players sit in picking order)")
        ->type_name("ORDER")
        ->check(one_of({"simultaneous", "seated"}));
    cmd->add_option("--players", args->players, "number of players (default 2)")->check(whole_in(2, max_race_pieces));
    cmd->add_flag("--distinct", args->distinct, "no option may be picked twice");
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
