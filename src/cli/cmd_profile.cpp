// overshoot profile SPEC...: finishing chances and times of each option alone.
#include <fmt/format.h>

#include <memory>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "render/profile.hpp"

namespace overshoot::cli {
namespace {

struct ProfileArgs {
    BoardFlags board;
    OutputFlags out;
    std::vector<std::string> specs;
    std::vector<double> quantiles;
    std::optional<std::string> distribution;
    double bound = 1e-12;
    long long max_rows = 100000;
};

void run(const ProfileArgs& a) {
    Setup s = resolve_setup(a.board, a.specs, 1, 1000);
    ProfileSettings ps;
    ps.quantiles = {0.5};
    for (double q : a.quantiles)
        if (q != 0.5) ps.quantiles.push_back(q);
    std::vector<Chain> chains;
    for (const auto& o : s.options) chains.push_back(build_chain(s.board, o));
    std::vector<render::ProfileEntry> entries;
    for (std::size_t i = 0; i < chains.size(); ++i) entries.push_back({&s.options[i], profile(chains[i], ps)});
    if (a.distribution) {
        std::vector<std::pair<const Option*, Distribution>> ds;
        for (std::size_t i = 0; i < chains.size(); ++i)
            ds.emplace_back(&s.options[i], distribution(chains[i], a.bound, a.max_rows));
        write_atomically(*a.distribution, render::distribution_csv(ds));
    }
    deliver(a.out, a.out.chosen() == "json" ? render::profile_json(s.board, s.order, entries).dump(2)
                                            : render::profile_text(s.board, s.order, entries));
}

const Registration reg(10, [](CLI::App& app) {
    auto args = std::make_shared<ProfileArgs>();
    auto* cmd = app.add_subcommand("profile", "finishing chance, mean, spread and median turns of each option alone");
    // Option words come verbatim from the extras (see option_words).
    cmd->allow_extras();
    set_usage(*cmd, "SPEC...", option_words_meaning);
    add_board_flags(*cmd, args->board, false);
    add_output_flags(*cmd, args->out, {"text", "json"});
    cmd->add_option("--quantile", args->quantiles,
                    "also report this quantile of the finishing turn, strictly between 0 and 1 (repeat the flag)")
        ->allow_extra_args(false)
        ->check(real_in(0, 1, true));
    cmd->add_option("--distribution", args->distribution, "write the finishing-time distribution to this CSV file");
    cmd->add_option("--bound", args->bound,
                    "list the distribution until the remaining finishing mass is below this (strictly between 0 and 1)")
        ->check(real_in(0, 1, true));
    cmd->add_option("--max-rows", args->max_rows, "at most this many rows per option in the distribution")
        ->check(whole_in(1, 100'000'000));
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
