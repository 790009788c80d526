// overshoot search SPEC...: board search. Changes to a board (added jumps, head
// starts, the length within a range) that make the tournament of the options meet a
// target: a named cycle, no Condorcet winner, everyone in the top cycle, or
// duels as even as possible (docs/search.md).
#include <fmt/format.h>

#include <algorithm>
#include <memory>
#include <optional>

#include "cli/common.hpp"
#include "cli/arguments.hpp"
#include "cli/registry.hpp"
#include "cli/search_flags.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "core/limits.hpp"
#include "render/search.hpp"
#include "search/search.hpp"

namespace overshoot::cli {
namespace {

struct SearchArgs {
    BoardFlags board;
    OutputFlags out;
    std::vector<std::string> specs;
    std::optional<std::string> target;
    std::optional<std::string> cycle;
    int jumps = 1;
    int head_starts = 0;
    std::optional<std::string> from, to, lengths;
    int keep = 5;
    unsigned long long seed = 1;
    int beam = 8;
    int sample = 1500;
    int threads = 0;
};

// "5,10..20,33" as a sorted list of squares.
std::vector<int> parse_squares(const std::string& text, const char* what) {
    std::vector<int> out;
    std::size_t at = 0;
    while (at <= text.size()) {
        const std::size_t comma = text.find(',', at);
        const std::string part = text.substr(at, comma == std::string::npos ? std::string::npos : comma - at);
        const auto range = number_range(part);
        if (!range || range->first < 0 || range->second > limits::max_length || range->first > range->second)
            throw InputError(fmt::format("{} '{}': expected squares and ranges like 5,10..20 (0 to {})", what, text,
                                         limits::max_length));
        for (long long s = range->first; s <= range->second; ++s) out.push_back(static_cast<int>(s));
        if (comma == std::string::npos) break;
        at = comma + 1;
    }
    std::sort(out.begin(), out.end());
    out.erase(std::unique(out.begin(), out.end()), out.end());
    return out;
}

void run(const SearchArgs& a) {
    BoardFlags flags = a.board;
    flags.head_starts_allowed = true;
    Setup s = resolve_setup(flags, a.specs, 2, 64);
    SearchSpec spec = search_spec_of(s, a.target, a.cycle, "");
    spec.max_jumps = a.jumps;
    spec.head_start_max = a.head_starts;
    if (a.from) spec.from_squares = parse_squares(*a.from, "--from");
    if (a.to) spec.to_squares = parse_squares(*a.to, "--to");
    if (a.lengths) std::tie(spec.length_lo, spec.length_hi) = parse_range(*a.lengths, "--lengths");
    spec.keep = a.keep;
    spec.seed = a.seed;
    spec.beam = a.beam;
    spec.sample = a.sample;
    spec.threads = a.threads;
    const SearchResult r = search_board(spec);
    const std::string format = a.out.chosen();
    if ((format == "scenario" || format == "svg") && r.best.empty())
        throw InputError("the search found no board to write");
    std::string text;
    if (format == "json")
        text = render::search_json(r, spec).dump(2);
    else if (format == "scenario")
        text = render::scenario_toml(r.best.front().board, spec.order, spec.options, r.best.front().starts);
    else if (format == "svg")
        text = render::svg::file(render::board_figure(r.best.front().board, r.best.front().added,
                                                      fmt::format("Best board of the search ({})", to_string(spec.target)),
                                                      render::start_marks(spec.options, r.best.front().starts)));
    else
        text = render::search_text(r, spec);
    deliver(a.out, text);
}

const Registration reg(34, [](CLI::App& app) {
    auto args = std::make_shared<SearchArgs>();
    auto* cmd = app.add_subcommand(
        "search", "board search: added jumps, head starts or a length that make the options form a cycle, lose their winner, or even out");
    set_usage(*cmd, "SPEC SPEC [SPEC...]", option_words_meaning);
    cmd->allow_extras();  // option words verbatim: CLI11 would split "[1,2,6]"
    add_board_flags(*cmd, args->board);
    // scenario: the best board as a scenario file; svg: a drawing of it with its jumps.
    add_output_flags(*cmd, args->out, {"text", "json", "scenario", "svg"});
    cmd->add_option("--target", args->target, "cycle, no-winner, top-cycle or fair (default: cycle with --cycle, else no-winner)")
        ->check(one_of({"cycle", "no-winner", "top-cycle", "fair"}));
    cmd->add_option("--cycle", args->cycle, "the wanted cycle, e.g. '1d6 > 3d6 > 2d6 > 1d6'");
    cmd->add_option("--jumps", args->jumps, "most jumps to add (default 1: every single jump, exhaustive; 2 to 8: beam search)")
        ->check(whole_in(0, 8));
    cmd->add_option("--head-starts", args->head_starts,
                    "also search head starts: any option may start on a square 0..H (default 0: every piece starts "
                    "where the board says)")
        ->type_name("H")
        ->check(whole_in(0, limits::max_length));
    cmd->add_option("--from", args->from, "squares an added jump may start on, e.g. 10..40,55 (default: any)");
    cmd->add_option("--to", args->to, "squares an added jump may lead to (default: any)");
    cmd->add_option("--lengths", args->lengths, "also search the length within LO..HI (the board's jumps must fit)")
        ->check(range_in(1, limits::max_length));
    cmd->add_option("--keep", args->keep, "boards listed: the best, then runners-up (default 5)")->check(whole_in(1, 100));
    cmd->add_option("--seed", args->seed, "seed of the beam search's sampling (default 1; same seed, same result)");
    cmd->add_option("--beam", args->beam, "boards the beam search keeps per level (default 8)")->check(whole_in(1, 1000));
    cmd->add_option("--sample", args->sample, "jumps the beam search tries per kept board and level (default 1500)")
        ->check(whole_in(1, 100'000'000));
    cmd->add_option("--threads", args->threads, "threads (0: all cores; same result for any count)")->check(whole_in(0, 4096));
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
