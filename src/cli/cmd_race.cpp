// overshoot race SPEC SPEC [SPEC...]: a race of 2 to 6 pieces on one board.
#include <fmt/format.h>

#include <memory>

#include "chain/chain.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/race_flags.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/several_pieces.hpp"
#include "render/several_pieces.hpp"

namespace overshoot::cli {

RaceOrder race_order_of(const std::optional<std::string>& flag, const BoardFlags& board) {
    if (flag) return parse_race_order(*flag);
    if (board.scenario) {
        Scenario sc = load_scenario(*board.scenario);
        if (sc.order && *sc.order != Order::simultaneous)
            throw InputError(fmt::format("{}: order '{}' is for duels; a race takes --order simultaneous or seated",
                                         *board.scenario, to_string(*sc.order)));
    }
    return RaceOrder::simultaneous;
}

std::vector<int> parse_starts(const std::vector<int>& out, std::size_t pieces) {
    if (!out.empty() && out.size() != pieces)
        throw InputError(fmt::format("--start is given {} times for {} pieces: give one per piece, in order", out.size(), pieces));
    return out;
}

namespace {

struct RaceArgs {
    BoardFlags board;
    std::vector<std::string> specs;
    std::optional<std::string> order;
    std::vector<int> starts;
    OutputFlags out;
};

void run(const RaceArgs& a) {
    Setup s = resolve_setup(a.board, a.specs, 2, max_race_pieces);
    const RaceOrder order = race_order_of(a.order, a.board);
    std::vector<int> starts = parse_starts(a.starts, s.options.size());
    std::vector<int> resolved;
    for (int st : starts) resolved.push_back(resolve_start(s.board, st));
    std::vector<Chain> chains;
    for (const auto& o : s.options) chains.push_back(build_chain(s.board, o));
    std::vector<const Chain*> ptr;
    for (const auto& c : chains) ptr.push_back(&c);
    RaceResult r = race(ptr, resolved, order);
    render::RaceView view{&s.board, order, &s.options, starts, &r};
    deliver(a.out, a.out.chosen() == "json" ? render::race_json(view).dump(2) : render::race_text(view));
}

const Registration reg(30, [](CLI::App& app) {
    auto args = std::make_shared<RaceArgs>();
    auto* cmd = app.add_subcommand("race", "a race of 2 to 6 pieces: each piece's chance to finish first alone");
    // Option words are taken verbatim from the extras: CLI11 would split a
    // bracketed die such as "[0,2,3]" given to a positional list.
    cmd->allow_extras();
    set_usage(*cmd, "SPEC SPEC [SPEC...]", "2 to 6 pieces, one option each: specs such as 1d6 or [1,2,6], or option names from --scenario");
    add_board_flags(*cmd, args->board, false);
    add_output_flags(*cmd, args->out, {"text", "json"});
    cmd->add_option("--order", args->order, "simultaneous (same-round finishers share) or seated (listed order, first to land wins; with two pieces the duel order a-first)")
        ->type_name("ORDER")
        ->check(one_of({"simultaneous", "seated"}));
    cmd->add_option("--start", args->starts, "start square of each piece, in order (repeat the flag once per piece, or A,B,...)")
        ->allow_extra_args(false)
        ->delimiter(',')
        ->check(whole_in(0, limits::max_length));
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli

