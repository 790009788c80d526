// overshoot profile SPEC...: finishing chances and times of each option alone.
#include <fmt/format.h>

#include <memory>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "render/race.hpp"

namespace overshoot::cli {
namespace {

struct ProfileArgs {
    BoardFlags board;
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
    for (double q : a.quantiles) {
        if (!(q > 0 && q < 1)) throw InputError(fmt::format("--quantile {}: must lie strictly between 0 and 1", q));
        if (q != 0.5) ps.quantiles.push_back(q);
    }
    if (!(a.bound > 0 && a.bound < 1)) throw InputError("--bound must lie strictly between 0 and 1");
    if (a.max_rows < 1) throw InputError("--max-rows must be at least 1");
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
    if (a.board.json)
        emit(render::profile_json(s.board, s.order, entries).dump(2));
    else
        emit(render::profile_text(s.board, s.order, entries));
}

const Registration reg(10, [](CLI::App& app) {
    auto args = std::make_shared<ProfileArgs>();
    auto* cmd = app.add_subcommand("profile", "finishing chance, mean, spread and median turns of each option alone");
    // Option words come verbatim from the extras (see option_words).
    cmd->allow_extras();
    add_board_flags(*cmd, args->board, false);
    cmd->add_option("--quantile", args->quantiles, "also report this quantile of the finishing turn (repeatable)");
    cmd->add_option("--distribution", args->distribution, "write the finishing-time distribution to this CSV file");
    cmd->add_option("--bound", args->bound, "list the distribution until the remaining finishing mass is below this");
    cmd->add_option("--max-rows", args->max_rows, "at most this many rows per option in the distribution");
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
