// overshoot duel A B: the exact race of two options on one board.
#include <memory>
#include <optional>

#include "chain/chain.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "race/long_duel.hpp"
#include "render/duel.hpp"

namespace overshoot::cli {
namespace {

struct DuelArgs {
    BoardFlags board;
    OutputFlags out;
    std::vector<std::string> specs;
    std::string method = "auto";
    bool exact = false;
};

void run(DuelArgs a) {
    a.board.head_starts_allowed = true;
    Setup s = resolve_setup(a.board, a.specs, 2, 2);
    DuelSettings ds;
    ds.method = parse_duel_method(a.method);
    // Long boards: no chain is built when the finishing windows lie apart.
    DuelResult r = duel_on_board(s.board, s.options[0], s.options[1], s.starts[0], s.starts[1], s.order, ds);
    std::optional<ExactDuel> ex;
    if (a.exact)  // refuses (exit 2) with the reason
        ex = exact_duel(build_chain(s.board, s.options[0], s.starts[0]), build_chain(s.board, s.options[1], s.starts[1]),
                        s.order);
    const ExactDuel* e = ex ? &*ex : nullptr;
    const Option &oa = s.options[0], &ob = s.options[1];
    const std::string format = a.out.chosen();
    if (format == "json")
        deliver(a.out, render::duel_json(s.board, s.order, oa, ob, r, s.starts, e).dump(2));
    else if (format == "md")
        deliver(a.out, render::duel_markdown(s.board, s.order, oa, ob, r, s.starts, e));
    else if (format == "latex")
        deliver(a.out, render::duel_latex(s.board, s.order, oa, ob, r, s.starts, e));
    else
        deliver(a.out, render::duel_text(s.board, s.order, oa, ob, r, s.starts, e));
}

const Registration reg(20, [](CLI::App& app) {
    auto args = std::make_shared<DuelArgs>();
    auto* cmd = app.add_subcommand("duel", "probability that option A finishes before option B, with a proven bound");
    // Option words come verbatim from the extras (see option_words).
    cmd->allow_extras();
    set_usage(*cmd, "A B", "the two options: specs such as 1d6, 2d6, [1,2,6] or {1:3,4:1} (docs/options.md), or option names from --scenario");
    add_board_flags(*cmd, args->board);
    add_output_flags(*cmd, args->out, {"text", "json", "md", "latex"});
    cmd->add_option("--method", args->method, "auto, pairs, zone, series, product or separated (docs/method.md)")
        ->check(one_of({"auto", "pairs", "zone", "series", "product", "separated"}));
    cmd->add_flag("--exact", args->exact, "also give every probability as an exact fraction (docs/exact.md)");
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
