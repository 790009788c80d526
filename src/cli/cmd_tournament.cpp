// overshoot tournament SPEC...: every option against every other on one board
// (or a win matrix from a CSV file), with the dominance digraph, its cycles,
// counters and the equilibrium mix.
#include <fmt/format.h>

#include <memory>
#include <optional>

#include "chain/chain.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "render/exact.hpp"
#include "render/tournament.hpp"
#include "tournament/matrix_csv.hpp"
#include "tournament/tournament.hpp"

namespace overshoot::cli {
namespace {

struct TournamentArgs {
    BoardFlags board;
    std::vector<std::string> specs;
    std::optional<std::string> matrix;
    std::optional<double> tolerance;
    int max_cycle_length = 6;
    long long cycle_cap = 10'000;
    OutputFlags out;
    std::string method = "auto";
    int threads = 0;
    bool exact = false;
};

void run(const TournamentArgs& a) {
    const std::string format = a.out.chosen();
    TournamentSettings settings;
    settings.max_cycle_length = a.max_cycle_length;
    settings.cycle_cap = static_cast<std::size_t>(a.cycle_cap);

    render::TournamentSource src;
    std::optional<nlohmann::json> exact;  // --exact: every P(row beats column) as a fraction
    if (a.exact && (a.matrix || format != "json"))
        throw InputError("--exact needs races (not --matrix) and JSON output (--json or --format json)");
    PairwiseMatrix matrix;
    if (a.matrix) {
        // The file replaces the races: board flags and options would be ignored, so refuse them.
        if (!a.specs.empty()) throw InputError("--matrix takes the options from the file; drop the option specs");
        const BoardFlags& f = a.board;
        if (f.length || f.overshoot || (f.jump_option && f.jump_option->count() > 0) || f.order || f.scenario ||
            (f.head_start_option && f.head_start_option->count() > 0))
            throw InputError("--matrix replaces the races: --length, --overshoot, --jump, --head-start, --order and --scenario do not apply");
        src.matrix_file = *a.matrix;
        src.tolerance = a.tolerance.value_or(0.0);
        matrix = read_matrix_csv(*a.matrix, src.tolerance);
    } else {
        BoardFlags flags = a.board;
        flags.head_starts_allowed = true;
        Setup s = resolve_setup(flags, a.specs, 1, 100'000);
        DuelSettings ds;
        ds.method = parse_duel_method(a.method);
        ds.want_median = false;  // the tournament reports no race lengths; lets the engine share work across pairs
        matrix = race_matrix(s.board, s.order, s.options, ds, a.threads, s.starts);
        if (a.exact) {
            std::vector<Chain> chains;
            for (std::size_t i = 0; i < s.options.size(); ++i)
                chains.push_back(build_chain(s.board, s.options[i], s.starts[i]));
            exact = render::exact_matrix_json(exact_matrix(chains, s.order, a.threads), chains.size());
        }
        src.board = s.board;
        src.order = s.order;
        src.options = s.options;
        src.starts = s.starts;
    }
    Tournament t = analyse(std::move(matrix), settings);

    std::string out;
    if (format == "json") {
        nlohmann::json j = render::tournament_json(t, src);
        if (exact) j["exact"] = *exact;
        out = j.dump(2) + "\n";
    } else if (format == "md")
        out = render::tournament_markdown(t, src);
    else if (format == "latex")
        out = render::tournament_latex(t, src);
    else if (format == "csv")
        out = render::tournament_csv(t);
    else if (format == "dot")
        out = render::tournament_dot(t, src);
    else
        out = render::tournament_text(t, src);
    deliver(a.out, out);
}

const Registration reg(40, [](CLI::App& app) {
    auto args = std::make_shared<TournamentArgs>();
    auto* cmd = app.add_subcommand(
        "tournament", "every option against every other: dominance digraph, cycles, counters, equilibrium mix");
    set_usage(*cmd, "[SPEC...]", option_words_meaning);
    // The option words are taken from the leftovers: a declared positional would let
    // CLI11 split a custom die "[1,2,6]" into three words.
    cmd->allow_extras();
    add_board_flags(*cmd, args->board);
    add_output_flags(*cmd, args->out, {"text", "json", "md", "latex", "csv", "dot"});
    auto* matrix = cmd->add_option("--matrix", args->matrix,
                                   "read P(row beats column) from a CSV file instead of racing (docs/tournament.md)");
    cmd->add_option("--tolerance", args->tolerance, "with --matrix: the error bound of every margin (default 0)")
        ->needs(matrix)
        ->check(real_in(0, 1));
    cmd->add_option("--max-cycle-length", args->max_cycle_length, "longest cycle listed (default 6, at least 3)")
        ->check(whole_in(3, 1000));
    cmd->add_option("--cycle-cap", args->cycle_cap, "most cycles listed, strongest first (default 10000)")
        ->check(whole_in(0, 1'000'000'000));
    cmd->add_option("--method", args->method, "duel method: auto, pairs, zone, series or product (docs/method.md)")
        ->check(one_of({"auto", "pairs", "zone", "series", "product"}));
    cmd->add_flag("--exact", args->exact, "with --json: also P(row beats column) and margins as exact fractions (docs/exact.md)");
    cmd->add_option("--threads", args->threads, "threads for the races (default 0: all cores)")->check(whole_in(0, 4096));
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
