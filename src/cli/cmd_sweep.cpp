// overshoot sweep SPEC... --lengths LO..HI: the same options over a range of
// lengths and rule variants, with crossovers and the intervals of each cycle.
#include <fmt/format.h>

#include <cstdio>
#include <memory>
#include <optional>

#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "render/sweep.hpp"
#include "sweep/sweep.hpp"

namespace overshoot::cli {

void add_variant_flags(CLI::App& cmd, std::vector<std::string>& rules, std::vector<std::string>& orders,
                       const char* order_help) {
    // One value per flag, or a comma list: a rule never swallows the option words after it.
    cmd.add_option("--overshoot", rules, "rule(s): stay, bounce, pass; repeat the flag or comma-separate for variants")
        ->type_name("RULE")
        ->allow_extra_args(false)
        ->delimiter(',')
        ->check(one_of({"stay", "bounce", "pass"}));
    cmd.add_option("--order", orders, order_help)
        ->type_name("ORDER")
        ->allow_extra_args(false)
        ->delimiter(',')
        ->check(one_of({"simultaneous", "a-first", "b-first", "coin"}));
}

// --jump (on the longest board, one value per flag or a comma list) and --anchor.
CLI::Option* add_jump_flags(CLI::App& cmd, std::vector<std::string>& jumps, std::string& anchor, const char* jump_help) {
    CLI::Option* jump = cmd.add_option("--jump", jumps, jump_help)->allow_extra_args(false)->delimiter(',');
    cmd.add_option("--anchor", anchor,
                   "jumps stay at the same squares from the start (start) or the same distance from the finish "
                   "(finish)")
        ->check(one_of({"start", "finish"}));
    return jump;
}

// The rule variants: every overshoot rule with every order, rules outer.
std::vector<Variant> variants_from(const std::vector<std::string>& rules, const std::vector<std::string>& orders,
                                   Overshoot default_rule, Order default_order) {
    std::vector<Overshoot> rs;
    std::vector<Order> os;
    for (const auto& r : rules) rs.push_back(parse_overshoot(r));
    for (const auto& o : orders) os.push_back(parse_order(o));
    if (rs.empty()) rs.push_back(default_rule);
    if (os.empty()) os.push_back(default_order);
    std::vector<Variant> out;
    for (auto r : rs)
        for (auto o : os) {
            bool dup = false;
            for (const auto& v : out) dup = dup || (v.rule == r && v.order == o);
            if (dup) throw InputError(fmt::format("the rule variant {} / {} is listed twice", to_string(r), to_string(o)));
            out.push_back({r, o});
        }
    return out;
}

namespace {

struct SweepArgs {
    std::vector<std::string> specs;
    std::string lengths;
    int step = 1;
    std::vector<std::string> rules, orders, jumps;
    CLI::Option* jump_option = nullptr;
    std::string anchor = "start";
    std::optional<std::string> scenario;
    OutputFlags out;
    std::string method = "auto";
    int threads = 0;
    int max_cycle_length = 6;
    std::optional<long long> memory_mib;
};

void run(const SweepArgs& a) {
    SweepSpec spec;
    const auto [lo, hi] = parse_range(a.lengths, "--lengths");
    spec.grid = LengthGrid{lo, hi, a.step};
    // Options, jumps and the scenario's defaults through the shared resolver,
    // on the longest board of the sweep (which validates the jumps).
    BoardFlags f;
    f.length = spec.grid.hi;
    f.scenario = a.scenario;
    f.memory_mib = a.memory_mib;
    f.jumps = a.jumps;
    f.jump_option = a.jump_option;
    Setup s = resolve_setup(f, a.specs, 2, 100);
    spec.options = s.options;
    spec.jumps = s.board.jumps;
    spec.anchor = parse_anchor(a.anchor);
    spec.variants = variants_from(a.rules, a.orders, s.board.rule, s.order);
    for (const auto& v : spec.variants)
        if (!spec.jumps.empty() || v.rule == Overshoot::bounce) make_board(spec.grid.hi, v.rule, spec.jumps);
    spec.engine.method = parse_length_method(a.method);
    spec.engine.threads = a.threads;
    spec.max_cycle_length = a.max_cycle_length;
    SweepResult r = run_sweep(spec);
    const std::string format = a.out.chosen();
    deliver(a.out, format == "json"    ? render::sweep_json(r).dump(2) + "\n"
                   : format == "csv"   ? render::sweep_csv(r)
                   : format == "md"    ? render::sweep_markdown(r)
                   : format == "latex" ? render::sweep_latex(r)
                                       : render::sweep_text(r));
    // The text carries the note itself; the other formats leave it to stderr.
    const std::string note = render::sweep_bound_note(r);
    if (!note.empty() && format != "text") std::fprintf(stderr, "overshoot: %s\n", note.c_str());
}

const Registration reg(60, [](CLI::App& app) {
    auto args = std::make_shared<SweepArgs>();
    auto* cmd = app.add_subcommand("sweep", "the same options over a range of lengths and rule variants: crossovers, "
                                            "cycle intervals, lengths with no dominant option");
    // Option words come from the leftovers: a declared positional would let
    // CLI11 split a custom die "[1,2,6]" into three words.
    cmd->allow_extras();
    set_usage(*cmd, "SPEC... --lengths LO..HI", option_words_meaning);
    cmd->add_option("--lengths", args->lengths, "range of lengths LO..HI (or one length)")
        ->required()
        ->check(range_in(1, limits::max_length));
    cmd->add_option("--step", args->step, "step between swept lengths (default 1)")->check(whole_in(1, limits::max_length));
    add_variant_flags(*cmd, args->rules, args->orders,
                      "turn order(s): simultaneous, coin (a-first, b-first for exactly two options); repeat the flag "
                      "or comma-separate");
    args->jump_option = add_jump_flags(*cmd, args->jumps, args->anchor,
                                       "a jump FROM:TO on the longest board; repeat the flag or give FROM:TO,FROM:TO");
    cmd->add_option("--scenario", args->scenario, "a TOML scenario file (flags override it)");
    add_output_flags(*cmd, args->out, {"text", "json", "csv", "md", "latex"});
    cmd->add_option("--method", args->method, "all-lengths method: auto, series, pairs, pairs-scalar, closure or zone-tail (docs/sweep.md)")
        ->check(one_of({"auto", "series", "pairs", "pairs-scalar", "closure", "zone-tail"}));
    cmd->add_option("--threads", args->threads, "threads (0: all cores; same output for any count)")->check(whole_in(0, 4096));
    cmd->add_option("--max-cycle-length", args->max_cycle_length, "longest cycle listed per length (default 6)")
        ->check(whole_in(3, 1000));
    add_memory_limit(*cmd, args->memory_mib);
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
