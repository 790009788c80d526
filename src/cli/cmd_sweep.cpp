// overshoot sweep SPEC... --lengths LO..HI: the same options over a range of
// lengths and rule variants, with crossovers and the intervals of each cycle.
#include <fmt/format.h>

#include <memory>
#include <optional>

#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "render/sweep.hpp"
#include "sweep/sweep.hpp"

namespace overshoot::cli {

// Comma lists and repeated flags: "stay,pass" or --overshoot stay --overshoot pass.
std::vector<std::string> split_list(const std::vector<std::string>& values) {
    std::vector<std::string> out;
    for (const auto& v : values) {
        std::size_t start = 0;
        while (true) {
            std::size_t c = v.find(',', start);
            std::string part = v.substr(start, c == std::string::npos ? std::string::npos : c - start);
            if (!part.empty()) out.push_back(part);
            if (c == std::string::npos) break;
            start = c + 1;
        }
    }
    return out;
}

// The rule variants: every overshoot rule with every order, rules outer.
std::vector<Variant> variants_from(const std::vector<std::string>& rules, const std::vector<std::string>& orders,
                                   Overshoot default_rule, Order default_order) {
    std::vector<Overshoot> rs;
    std::vector<Order> os;
    for (const auto& r : split_list(rules)) rs.push_back(parse_overshoot(r));
    for (const auto& o : split_list(orders)) os.push_back(parse_order(o));
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
    bool json = false, csv = false;
    std::string method = "auto";
    int threads = 0;
    int max_cycle_length = 6;
    std::optional<long long> memory_mib;
    std::optional<std::string> output;
};

void run(const SweepArgs& a) {
    if (a.json && a.csv) throw InputError("give either --json or --csv, not both");
    if (a.threads < 0) throw InputError("--threads must be 0 (all cores) or more");
    if (a.lengths.empty()) throw InputError("no lengths: give --lengths LO..HI");
    SweepSpec spec;
    spec.grid = parse_lengths(a.lengths, a.step);
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
    if (a.max_cycle_length < 3) throw InputError("--max-cycle-length must be at least 3");
    SweepResult r = run_sweep(spec);
    std::string out = a.json ? render::sweep_json(r).dump(2) + "\n" : a.csv ? render::sweep_csv(r) : render::sweep_text(r);
    if (a.output)
        write_atomically(*a.output, out);
    else
        emit(out);
}

const Registration reg(60, [](CLI::App& app) {
    auto args = std::make_shared<SweepArgs>();
    auto* cmd = app.add_subcommand("sweep", "the same options over a range of lengths and rule variants: crossovers, "
                                            "cycle intervals, lengths with no dominant option");
    // Option words come from the leftovers: a declared positional would let
    // CLI11 split a custom die "[1,2,6]" into three words.
    cmd->allow_extras();
    cmd->add_option("--lengths", args->lengths, "range of lengths LO..HI (or one length)");
    cmd->add_option("--step", args->step, "step between swept lengths (default 1)");
    cmd->add_option("--overshoot", args->rules, "rule(s): stay, bounce, pass; repeat or comma-separate for variants");
    cmd->add_option("--order", args->orders,
                    "turn order(s): simultaneous, coin (a-first, b-first for exactly two options); repeat or "
                    "comma-separate");
    args->jump_option = cmd->add_option("--jump", args->jumps, "a jump FROM:TO on the longest board (repeatable)");
    cmd->add_option("--anchor", args->anchor,
                    "jumps stay at the same squares from the start (start) or the same distance from the finish "
                    "(finish)");
    cmd->add_option("--scenario", args->scenario, "a TOML scenario file (flags override it)");
    cmd->add_flag("--json", args->json, "print one JSON document");
    cmd->add_flag("--csv", args->csv, "print CSV: one row per length and pair");
    cmd->add_option("--method", args->method, "all-lengths method: auto, series or pairs (docs/sweep.md)");
    cmd->add_option("--threads", args->threads, "threads (0: all cores; same output for any count)");
    cmd->add_option("--max-cycle-length", args->max_cycle_length, "longest cycle listed per length (default 6)");
    cmd->add_option("--memory-limit", args->memory_mib, "memory cap in MiB for one computation (default 4096)");
    cmd->add_option("--output", args->output, "write to this file (atomically) instead of stdout");
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
