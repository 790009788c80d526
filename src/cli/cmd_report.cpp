// overshoot report [SPEC...]: one self-contained HTML report (or one SVG
// figure alone) for a scenario or options and board flags.
#include <fmt/format.h>

#include <memory>
#include <optional>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/race_flags.hpp"
#include "cli/registry.hpp"
#include "cli/search_flags.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "policy/duel_policy.hpp"
#include "race/choice.hpp"
#include "race/several_pieces.hpp"
#include "render/figures.hpp"
#include "render/report.hpp"
#include "render/svg.hpp"
#include "search/search.hpp"
#include "race/balance.hpp"
#include "sweep/sweep.hpp"
#include "tournament/tournament.hpp"

namespace overshoot::cli {
namespace {

struct ReportArgs {
    BoardFlags board;
    std::vector<std::string> specs;
    OutputFlags out;
    std::optional<std::string> lengths;
    int step = 1;
    std::optional<std::string> figure;
    bool race = false;
    std::optional<std::string> race_order;
    int choose = 0;
    bool distinct = false;
    std::optional<std::string> balance_starts;
    std::optional<std::string> balance_lengths;
    std::optional<std::string> policy_against, policy_against_menu;
    int policy_distance = 0;
    std::optional<std::string> search_target, search_cycle;
    int search_jumps = 1, search_head_starts = 0;
    int threads = 0;
};

// The distribution is listed until 1e-9 of the finishing mass remains: the
// figure cuts at 99% anyway, and the closing row carries the rest.
constexpr double distribution_bound = 1e-9;
constexpr long long distribution_rows = 200'000;

void run(const ReportArgs& a) {
    // One figure alone is SVG; the whole report is HTML.
    if (a.figure && a.out.format == std::optional<std::string>("html"))
        throw InputError("--figure writes one SVG figure: drop --format html (or drop --figure for the HTML report)");
    if (!a.figure && a.out.chosen() == "svg")
        throw InputError("--format svg writes one figure: say which with --figure digraph|sweep|distribution");
    if (a.figure && *a.figure == "sweep" && !a.lengths) throw InputError("--figure sweep needs --lengths LO..HI");

    Setup s = resolve_setup(a.board, a.specs, 1, 100);
    const std::string fig = a.figure.value_or("");
    const bool want_all = fig.empty();
    const bool multi = a.race || a.choose > 0 || a.balance_starts || a.balance_lengths;
    if (!want_all && multi) throw InputError("--race, --choose and --balance-* belong to the HTML report, not to --figure");
    if (multi && s.options.size() < 2 && (a.race || a.balance_starts || a.balance_lengths))
        throw InputError("--race and --balance-* need at least two options");
    if ((a.race || a.balance_starts || a.balance_lengths) && s.options.size() > static_cast<std::size_t>(max_race_pieces))
        throw InputError(fmt::format("--race and --balance-* take at most {} options (one piece each)", max_race_pieces));
    RaceOrder race_order = RaceOrder::simultaneous;
    if (a.race_order) {
        race_order = parse_race_order(*a.race_order);
    } else if (multi && s.order != Order::simultaneous) {
        throw InputError(fmt::format("order '{}' is for duels; give --race-order simultaneous or seated for the race sections",
                                     to_string(s.order)));
    }
    if (!want_all && (a.policy_against || a.policy_against_menu))
        throw InputError("--policy-against and --policy-against-menu belong to the HTML report, not to --figure");
    if (a.race_order && !multi) throw InputError("--race-order applies to --race, --choose and --balance-* only");
    if (!a.search_target && (a.search_cycle || a.search_jumps != 1 || a.search_head_starts != 0))
        throw InputError("--search-cycle, --search-jumps and --search-head-starts go with --search-target");
    if (a.search_target && !want_all) throw InputError("--search-target belongs to the HTML report, not to --figure");

    render::ReportInput in;
    in.board = &s.board;
    in.order = s.order;
    in.options = &s.options;
    in.source = a.board.scenario ? "scenario " + *a.board.scenario : std::string("command line");
    in.race_order = race_order;

    std::vector<Chain> chains;
    if (want_all || fig == "distribution")
        for (const auto& o : s.options) chains.push_back(build_chain(s.board, o));
    if (want_all)
        for (const auto& c : chains) in.profiles.push_back(profile(c));
    if (want_all || fig == "distribution")
        for (const auto& c : chains) in.distributions.push_back(distribution(c, distribution_bound, distribution_rows));

    std::optional<Tournament> tour;
    if (want_all || fig == "digraph") {
        DuelSettings ds;
        ds.want_median = false;
        tour = analyse(race_matrix(s.board, s.order, s.options, ds, a.threads));
        in.tournament = &*tour;
    }

    std::optional<SweepResult> sweep;
    if (a.lengths && (want_all || fig == "sweep")) {
        SweepSpec spec;
        const auto [lo, hi] = parse_range(*a.lengths, "--lengths");
        spec.grid = LengthGrid{lo, hi, a.step};
        spec.options = s.options;
        spec.jumps = s.board.jumps;
        spec.variants = {Variant{s.board.rule, s.order}};
        if (!spec.jumps.empty() || s.board.rule == Overshoot::bounce) make_board(spec.grid.hi, s.board.rule, spec.jumps);
        spec.engine.threads = a.threads;
        sweep = run_sweep(spec);
        in.sweep = &*sweep;
    }

    if (!want_all) {
        std::vector<std::string> names;
        for (const auto& o : s.options) names.push_back(o.name);
        render::svg::Element e = fig == "digraph" ? render::digraph_figure(*tour)
                                 : fig == "sweep" ? render::sweep_figure(*sweep)
                                                  : render::distribution_figure(names, in.distributions);
        deliver(a.out, render::svg::file(e));
        return;
    }

    std::vector<const Chain*> ptr;
    for (const auto& c : chains) ptr.push_back(&c);
    std::optional<RaceResult> race_result;
    std::optional<ChoiceResult> choice;
    std::optional<HeadStartResult> starts;
    std::optional<LengthsResult> fair;
    if (a.race) {
        race_result = race(ptr, {}, race_order);
        in.race = &*race_result;
    }
    if (a.choose > 0) {
        RaceCache cache(s.board, ptr, race_order);
        choice = solve_choice(cache, static_cast<int>(s.options.size()), a.choose, a.distinct);
        in.choice = &*choice;
    }
    if (a.balance_starts) {
        auto [lo, hi] = parse_range(*a.balance_starts, "--balance-starts");
        RaceCache cache(s.board, ptr, race_order);
        starts = balance_starts(cache, static_cast<int>(s.options.size()), lo, hi);
        in.head_starts = &*starts;
    }
    if (a.balance_lengths) {
        auto [lo, hi] = parse_range(*a.balance_lengths, "--balance-lengths");
        fair = balance_lengths(s.board, s.options, race_order, lo, hi);
        in.fair_lengths = &*fair;
    }
    // The policy section: the report's options are A's menu.
    std::optional<PolicyComparison> policy;
    std::vector<Option> against;
    std::optional<render::DuelPolicyView> policy_view;
    if (a.policy_against || a.policy_against_menu) {
        if (a.policy_against && a.policy_against_menu)
            throw InputError("give --policy-against or --policy-against-menu, not both");
        against = a.policy_against ? resolve_setup(a.board, {*a.policy_against}, 1, 1).options
                                   : resolve_setup(a.board, list_words(*a.policy_against_menu, "--policy-against-menu"),
                                                   1, max_menu_options)
                                         .options;
        if (s.options.size() > static_cast<std::size_t>(max_menu_options))
            throw InputError(fmt::format("--policy-*: a menu holds at most {} options", max_menu_options));
        std::vector<Chain> other;
        for (const auto& o : against) other.push_back(build_chain(s.board, o));
        policy = compare_policies(chains, other, s.order, false);
        policy_view = render::DuelPolicyView{&s.board, s.order, &s.options, &against, &*policy, false, a.policy_distance};
        in.policy = &*policy_view;
    }
    // The board search section: the report's options on the report's board.
    SearchSpec search_spec;
    std::optional<SearchResult> found;
    if (a.search_target) {
        search_spec = search_spec_of(s, a.search_target, a.search_cycle, "search-");
        search_spec.max_jumps = a.search_jumps;
        search_spec.head_start_max = a.search_head_starts;
        search_spec.threads = a.threads;
        found = search_board(search_spec);
        in.search = &*found;
        in.search_spec = &search_spec;
    }
    deliver(a.out, render::report_html(in));
}

const Registration reg(80, [](CLI::App& app) {
    auto args = std::make_shared<ReportArgs>();
    auto* cmd = app.add_subcommand(
        "report", "one self-contained HTML report with figures (or one SVG figure alone)");
    set_usage(*cmd, "[SPEC...]", option_words_meaning);
    // Option words come from the leftovers: a declared positional would let
    // CLI11 split a custom die "[1,2,6]" into three words.
    cmd->allow_extras();
    add_board_flags(*cmd, args->board);
    add_output_flags(*cmd, args->out, {"html", "svg"});
    cmd->add_option("--lengths", args->lengths, "also sweep this range of lengths LO..HI (adds the sweep figure)")
        ->check(range_in(1, limits::max_length));
    cmd->add_option("--step", args->step, "step between swept lengths (default 1)")->check(whole_in(1, limits::max_length));
    cmd->add_option("--figure", args->figure, "write one figure alone, as SVG: digraph, sweep or distribution")
        ->check(one_of({"digraph", "sweep", "distribution"}));
    cmd->add_flag("--race", args->race, "add a race of all the options, one piece each (2 to 6)");
    cmd->add_option("--race-order", args->race_order, "order of the race sections: simultaneous or seated")
        ->check(one_of({"simultaneous", "seated"}));
    auto* choose = cmd->add_option("--choose", args->choose, "add the choice game of this many players")
                       ->check(whole_in(2, max_race_pieces));
    cmd->add_flag("--distinct", args->distinct, "in the choice game no option may be picked twice")->needs(choose);
    cmd->add_option("--balance-starts", args->balance_starts, "add the fairest head starts on squares LO..HI")
        ->check(range_in(0, limits::max_length));
    cmd->add_option("--balance-lengths", args->balance_lengths, "add the fairest lengths in LO..HI")
        ->check(range_in(1, limits::max_length));
    cmd->add_option("--policy-against", args->policy_against,
                    "add the optimal policy of choosing from the options each turn against this fixed option")
        ->type_name("SPEC");
    cmd->add_option("--policy-against-menu", args->policy_against_menu,
                    "add the game of choosing each turn: the options against this menu SPEC,SPEC,...")
        ->type_name("SPEC,...");
    cmd->add_option("--policy-distance", args->policy_distance, "the policy map shows distances 1..D (default 0: all)")
        ->check(whole_in(0, limits::max_length))
        ->type_name("D");
    cmd->add_option("--search-target", args->search_target,
                    "add a board search for these options (docs/search.md): cycle, no-winner, top-cycle or fair")
        ->check(one_of({"cycle", "no-winner", "top-cycle", "fair"}));
    cmd->add_option("--search-cycle", args->search_cycle, "the wanted cycle of --search-target cycle, e.g. '1d6 > 3d6 > 2d6 > 1d6'");
    cmd->add_option("--search-jumps", args->search_jumps, "most jumps the board search adds (default 1: exhaustive)")
        ->check(whole_in(0, 8));
    cmd->add_option("--search-head-starts", args->search_head_starts,
                    "the board search also moves start squares to 0..H (default 0: no)")
        ->type_name("H")
        ->check(whole_in(0, limits::max_length));
    cmd->add_option("--threads", args->threads, "threads for the races (default 0: all cores)")->check(whole_in(0, 4096));
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
