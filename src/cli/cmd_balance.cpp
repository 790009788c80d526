// overshoot balance SPEC...: head starts, lengths and single jumps that make a
// race of the given options (one piece each) as fair as possible.
#include <fmt/format.h>

#include <memory>

#include "chain/chain.hpp"
#include "cli/common.hpp"
#include "cli/race_flags.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/balance.hpp"
#include "render/several_pieces.hpp"

namespace overshoot::cli {
namespace {

struct BalanceArgs {
    BoardFlags board;
    std::vector<std::string> specs;
    std::optional<std::string> order;
    std::optional<std::string> starts;
    std::optional<std::string> lengths;
    bool jumps = false;
    int keep = 5;
    OutputFlags out;
};

void run(const BalanceArgs& a) {
    Setup s = resolve_setup(a.board, a.specs, 2, max_race_pieces);
    const RaceOrder order = race_order_of(a.order, a.board);
    if (!a.starts && !a.lengths && !a.jumps)
        throw InputError("balance: say what to change: --starts LO..HI, --lengths LO..HI and/or --try-jumps");
    std::vector<Chain> chains;
    for (const auto& o : s.options) chains.push_back(build_chain(s.board, o));
    std::vector<const Chain*> ptr;
    for (const auto& c : chains) ptr.push_back(&c);
    std::optional<HeadStartResult> hs;
    std::optional<LengthsResult> ls;
    std::optional<JumpSearchResult> js;
    const int n = static_cast<int>(s.options.size());
    if (a.starts) {
        auto [lo, hi] = parse_range(*a.starts, "--starts");
        RaceCache cache(s.board, ptr, order);
        hs = balance_starts(cache, n, lo, hi, a.keep);
    }
    if (a.lengths) {
        auto [lo, hi] = parse_range(*a.lengths, "--lengths");
        ls = balance_lengths(s.board, s.options, order, lo, hi, a.keep);
    }
    if (a.jumps) js = search_jumps(s.board, s.options, order, a.keep);
    render::BalanceView view{&s.board, order, &s.options, hs ? &*hs : nullptr, ls ? &*ls : nullptr,
                             js ? &*js : nullptr};
    deliver(a.out, a.out.chosen() == "json" ? render::balance_json(view).dump(2) : render::balance_text(view));
}

const Registration reg(32, [](CLI::App& app) {
    auto args = std::make_shared<BalanceArgs>();
    auto* cmd = app.add_subcommand("balance", "head starts, lengths or one jump that make a race of the options fairest");
    // Option words are taken verbatim from the extras: CLI11 would split a
    // bracketed die such as "[0,2,3]" given to a positional list.
    cmd->allow_extras();
    set_usage(*cmd, "SPEC SPEC [SPEC...]", "2 to 6 pieces, one option each: specs such as 1d6 or [1,2,6], or option names from --scenario");
    add_board_flags(*cmd, args->board, false);
    add_output_flags(*cmd, args->out, {"text", "json"});
    cmd->add_option("--order", args->order, "race order: simultaneous or seated")->type_name("ORDER")->check(one_of({"simultaneous", "seated"}));
    cmd->add_option("--starts", args->starts, "search a start square LO..HI for every option (exact, pruned)")
        ->check(range_in(0, limits::max_length));
    cmd->add_option("--lengths", args->lengths, "race at every length LO..HI and list the fairest")
        ->check(range_in(1, limits::max_length));
    cmd->add_flag("--try-jumps", args->jumps, "try every single added jump (boards up to 80 squares)");
    cmd->add_option("--keep", args->keep, "how many best answers to list (default 5)")->check(whole_in(1, 100));
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
