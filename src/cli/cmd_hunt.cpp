// overshoot hunt FAMILY...: search a family of options over lengths and rule
// variants for intransitive sets (cycles) of a wanted size and strength.
#include <fmt/format.h>
#include <unistd.h>

#include <chrono>
#include <csignal>
#include <functional>
#include <cstdio>
#include <memory>
#include <mutex>
#include <optional>

#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "core/limits.hpp"
#include "core/parallel.hpp"
#include "render/sweep.hpp"
#include "core/constraint_family.hpp"
#include "core/family.hpp"
#include "core/scenario.hpp"
#include "hunt/hunt.hpp"

#ifdef OVERSHOOT_HAVE_MPI
#include "hunt/mpi/ranks.hpp"
#endif

namespace overshoot::cli {

void add_variant_flags(CLI::App& cmd, std::vector<std::string>& rules, std::vector<std::string>& orders,
                       const char* order_help);
std::vector<Variant> variants_from(const std::vector<std::string>& rules, const std::vector<std::string>& orders,
                                   Overshoot default_rule, Order default_order);
CLI::Option* add_jump_flags(CLI::App& cmd, std::vector<std::string>& jumps, std::string& anchor, const char* jump_help);

namespace {

std::atomic<bool> interrupted{false};  // stop computing (a signal, or --stop-after-pairs)
std::atomic<bool> signalled{false};    // a signal came (SIGINT or SIGTERM)

extern "C" void on_signal(int sig) {
    interrupted.store(true);
    signalled.store(true);
    std::signal(sig, SIG_DFL);  // a second Ctrl-C ends the program at once
}

struct HuntArgs {
    std::vector<std::string> family;
    std::optional<std::string> lengths;
    std::optional<int> length;
    int step = 1;
    std::vector<std::string> jumps;
    CLI::Option* jump_option = nullptr;
    std::string anchor = "start";
    std::optional<std::string> scenario;
    std::vector<std::string> rules, orders;
    int cycle_length = 3;
    double min_strength = 0;
    std::optional<std::string> require;
    long long list = 100;
    std::optional<std::string> checkpoint;
    bool resume = false;
    int threads = 0;
    OutputFlags out;
    std::string method = "auto";
    long long stop_after = -1;
    std::optional<long long> memory_mib;
    bool plan = false, plan_only = false, timings = false;
    std::optional<int> ranks;  // --plan-only outside mpirun: plan for this many ranks
    std::optional<double> progress_every;  // seconds between progress lines
};

// One line on stderr at most every `seconds` (and at 100%), for logs of long runs.
std::function<void(std::size_t, std::size_t)> progress_lines(double seconds, std::string who) {
    auto last = std::make_shared<std::chrono::steady_clock::time_point>(std::chrono::steady_clock::now());
    auto start = *last;
    return [=](std::size_t done, std::size_t total) {
        const auto now = std::chrono::steady_clock::now();
        if (done < total && std::chrono::duration<double>(now - *last).count() < seconds) return;
        *last = now;
        std::fprintf(stderr, "overshoot: hunt%s: %.1f%% of %s cells after %.0f s\n", who.c_str(),
                     total ? 100.0 * static_cast<double>(done) / static_cast<double>(total) : 100.0,
                     who.empty() ? "its" : "this rank's", std::chrono::duration<double>(now - start).count());
        std::fflush(stderr);
    };
}

// Threads of one process: --threads, else its share of the cores (core/parallel.hpp).
int threads_for(const HuntArgs& a, int processes_here) {
    return a.threads > 0 ? a.threads : threads_per_process(processes_here);
}

// `--plan`: the plan on stderr before the work.
std::function<void(const HuntPlan&)> plan_to_stderr(const HuntSpec& spec, int threads) {
    return [&spec, threads](const HuntPlan& p) {
        std::fputs(render::hunt_plan_text(p, spec, threads).c_str(), stderr);
        std::fflush(stderr);
    };
}

// Only the plan: nothing is computed.
void print_plan_only(const HuntArgs& a, const HuntSpec& spec, int ranks, int threads) {
    validate_hunt(spec);
    const HuntStore store = load_hunt_store(spec);
    HuntSpec s = spec;
    s.engine.threads = threads;
    const HuntPlan plan = plan_hunt(s, store, ranks, threads);
    deliver(a.out, a.out.chosen() == "json" ? render::hunt_plan_json(plan, spec, threads).dump(2) + "\n"
                                            : render::hunt_plan_text(plan, spec, threads));
}

void finish(const HuntArgs& a, const HuntResult& r, const HuntSpec& spec) {
    const std::string format = a.out.chosen();
    deliver(a.out, format == "json"    ? render::hunt_json(r, spec).dump(2) + "\n"
                   : format == "md"    ? render::hunt_markdown(r, spec)
                   : format == "latex" ? render::hunt_latex(r, spec)
                                       : render::hunt_text(r, spec));
    const std::string note = render::hunt_bound_note(r);
    if (!note.empty() && format != "text") std::fprintf(stderr, "overshoot: %s\n", note.c_str());
    if (!r.complete) {
        std::fprintf(stderr, "overshoot: hunt interrupted: %zu of %zu pairs known%s\n", r.pairs_known, r.pairs_total,
                     spec.checkpoint.empty() ? "" : "; continue with --resume");
        exit_status() = 130;
    }
}

#ifdef OVERSHOOT_HAVE_MPI
std::string id_runs(const std::vector<std::size_t>& ids) {
    std::string s;
    for (std::size_t i = 0; i < ids.size();) {
        std::size_t j = i;
        while (j + 1 < ids.size() && ids[j + 1] == ids[j] + 1) ++j;
        s += (s.empty() ? "" : ", ") + (j == i ? fmt::format("{}", ids[i]) : fmt::format("{}-{}", ids[i], ids[j]));
        i = j + 1;
    }
    return s;
}

// Under mpirun: every rank runs this; rank 0 alone writes the output.
void run_ranks(const HuntArgs& a, HuntSpec& spec) {
    cluster::Ranks ranks;
    // Rank 0 alone plans and speaks; the others have nothing to add.
    if (a.plan_only) {
        if (ranks.rank() != 0) return;
        if (a.ranks) throw InputError("--ranks is for --plan-only outside mpirun; under mpirun the ranks are mpirun's");
        print_plan_only(a, spec, ranks.size(), threads_for(a, ranks.local_size()));
        return;
    }
    std::signal(SIGTERM, on_signal);
    std::signal(SIGINT, on_signal);
    const int threads = threads_for(a, ranks.local_size());
    spec.engine.threads = threads;
    if (a.progress_every) spec.progress = progress_lines(*a.progress_every, fmt::format(" rank {}", ranks.rank()));
    if (a.plan && ranks.rank() == 0) spec.on_plan = plan_to_stderr(spec, threads);
    cluster::RanksOutcome o;
    try {
        o = cluster::run_hunt_ranks(spec, ranks, signalled);
    } catch (const cluster::RankError& e) {
        std::fprintf(stderr, "overshoot: error: rank %d of %d: %s\n", ranks.rank(), ranks.size(), e.message.c_str());
        std::fflush(stderr);
        ranks.abort(e.status);
    } catch (const InputError&) {
        if (ranks.rank() == 0) throw;  // every rank has the same error: one line is enough
        exit_status() = 2;
        return;
    }
    if (o.signalled) {
        if (o.root) {
            std::string where = spec.checkpoint.empty()
                                    ? std::string("no --checkpoint was given, so nothing is kept")
                                    : fmt::format("{} of {} pairs are whole in the checkpoints beside {}; run the same "
                                                  "command with --resume to redo only the unfinished shards",
                                                  o.pairs_saved, o.plan.pairs_total, spec.checkpoint);
            std::fprintf(stderr,
                         "overshoot: the hunt stopped before the end (a signal, or a rank ended and the job is being "
                         "torn down): unfinished shards %s of %zu; %s\n",
                         o.unfinished.empty() ? "none" : id_runs(o.unfinished).c_str(), o.plan.shards.size(),
                         where.c_str());
            std::fflush(stderr);
        }
        cluster::Ranks::leave(o.root ? 1 : 143);
    }
    if (!o.root) return;
    if (a.timings) std::fputs(render::rank_times_text(o.busy_seconds, o.shard_count, o.threads).c_str(), stderr);
    finish(a, o.result, spec);
}
#endif

void run(const HuntArgs& a) {
    apply_memory_limit(a.memory_mib);
    HuntSpec spec;
    // The board: flags, else the scenario's (its options are the family when no family is given).
    Scenario sc;
    if (a.scenario) sc = load_scenario(*a.scenario);
    if (!a.family.empty()) {
        FamilyOptions f = expand_families(a.family);
        spec.options = std::move(f.options);
        spec.merged_options = f.merged;
    } else if (!sc.options.empty()) {
        std::vector<Option> opts;
        for (const auto& ns : sc.options) opts.push_back(parse_option(ns.spec, ns.name));
        spec.merged_options = merge_equal_options(opts);
        spec.options = std::move(opts);
    } else
        throw InputError("hunt: give a family of options, e.g. 'dice(count=1..6, sides=4,6,8,10,12,20)' (docs/sweep.md)");
    int lo = 0, hi = 0;
    if (a.lengths)
        std::tie(lo, hi) = parse_range(*a.lengths, "--lengths");
    else if (a.length)
        lo = hi = *a.length;
    else if (sc.length)
        lo = hi = *sc.length;
    else
        throw InputError("hunt: give the lengths: --lengths LO..HI, --length N, or a scenario with [board] length");
    spec.grid = LengthGrid{lo, hi, a.step};
    spec.variants = variants_from(a.rules, a.orders, sc.rule.value_or(Overshoot::stay),
                                  sc.order.value_or(Order::simultaneous));
    if (a.jump_option && a.jump_option->count() > 0) {
        for (const auto& j : a.jumps) spec.jumps.push_back(parse_jump(j));
    } else if (sc.jumps)
        spec.jumps = *sc.jumps;
    spec.anchor = parse_anchor(a.anchor);
    spec.cycle_length = a.cycle_length;
    spec.min_strength = a.min_strength;
    if (a.require) {
        for (std::size_t i = 0; i < spec.options.size(); ++i)
            if (spec.options[i].name == *a.require) spec.required = i;
        if (!spec.required) throw InputError(fmt::format("--require '{}': no option of the family has that name", *a.require));
    }
    spec.max_listed = static_cast<std::size_t>(a.list);
    spec.engine.method = parse_length_method(a.method);
    spec.engine.threads = a.threads;
    spec.checkpoint = a.checkpoint.value_or("");
    spec.resume = a.resume;
    spec.stop_after_pairs = a.stop_after;
    spec.cancel = &interrupted;
    // A progress bar on a terminal: the cells (pair x length) this process has
    // to compute. Under mpirun stderr goes through mpirun, so there is none.
    const bool bar = ::isatty(2) != 0 && !a.progress_every;
    std::mutex bar_mutex;
    if (a.progress_every) {
        spec.progress = progress_lines(*a.progress_every, "");
    } else if (bar)
        spec.progress = [&](std::size_t done, std::size_t total) {
            std::lock_guard<std::mutex> lock(bar_mutex);
            const int width = 30;
            const int filled = total ? static_cast<int>(width * done / total) : width;
            std::fprintf(stderr, "\r[%s%s] %3d%%", std::string(filled, '#').c_str(),
                         std::string(width - filled, '.').c_str(),
                         total ? static_cast<int>(100 * done / total) : 100);
            std::fflush(stderr);
        };
#ifdef OVERSHOOT_HAVE_MPI
    if (cluster::launched_by_mpirun()) {
        run_ranks(a, spec);
        return;
    }
#endif
    if (a.timings) throw InputError("--timings reports the time of each MPI rank: run the hunt under mpirun");
    if (a.plan_only) {
        print_plan_only(a, spec, a.ranks.value_or(1), threads_for(a, 1));
        return;
    }
    if (a.plan) spec.on_plan = plan_to_stderr(spec, threads_for(a, 1));
    std::signal(SIGINT, on_signal);
    std::signal(SIGTERM, on_signal);
    HuntResult r = run_hunt(spec);
    std::signal(SIGINT, SIG_DFL);
    std::signal(SIGTERM, SIG_DFL);
    if (bar) std::fprintf(stderr, "\r%60s\r", "");
    finish(a, r, spec);
}

const Registration reg(70, [](CLI::App& app) {
    auto args = std::make_shared<HuntArgs>();
    auto* cmd = app.add_subcommand("hunt", "search a family of options over lengths and rules for intransitive sets");
    // Family words come from the leftovers so that CLI11 never splits
    // "dice(count=1..6, sides=4,6,8)" or "[0,3,3,5]" at its commas.
    cmd->allow_extras();
    set_usage(*cmd, "FAMILY... --lengths LO..HI",
              "the options searched: families such as dice(count=1..6, sides=4,6,8,10,12,20) and specs such as 1d6 or [0,3,3,5] "
              "(docs/sweep.md)");
    auto* lengths = cmd->add_option("--lengths", args->lengths, "range of lengths LO..HI (or one length)")
                        ->check(range_in(1, limits::max_length));
    cmd->add_option("--length", args->length, "one length (as --lengths N)")
        ->check(whole_in(1, limits::max_length))
        ->excludes(lengths);
    args->jump_option = add_jump_flags(*cmd, args->jumps, args->anchor,
                                       "a jump FROM:TO on the longest board; repeat the flag or give FROM:TO,FROM:TO "
                                       "(replaces the scenario's jumps)");
    cmd->add_option("--scenario", args->scenario,
                    "a TOML scenario file: its board (length, rule, jumps, order) and, with no family given, its "
                    "options (flags override it)");
    cmd->add_option("--step", args->step, "step between lengths (default 1)")->check(whole_in(1, limits::max_length));
    add_variant_flags(*cmd, args->rules, args->orders,
                      "turn order(s): simultaneous, coin; repeat the flag or comma-separate");
    cmd->add_option("--cycle-length", args->cycle_length, "options in a wanted cycle (default 3)")->check(whole_in(3, 1000));
    cmd->add_option("--min-strength", args->min_strength, "smallest margin of a wanted cycle, as a probability (e.g. 0.01)")
        ->check(real_in(0, 1));
    cmd->add_option("--require", args->require, "an option name every wanted cycle contains");
    cmd->add_option("--list", args->list, "most sets listed (default 100; the totals count all)")
        ->check(whole_in(1, 1'000'000'000));
    auto* checkpoint =
        cmd->add_option("--checkpoint", args->checkpoint, "keep finished work in this file (written atomically)");
    cmd->add_flag("--resume", args->resume, "continue from --checkpoint without redoing finished pairs")->needs(checkpoint);
    cmd->add_option("--threads", args->threads, "threads (0: all cores; same output for any count)")->check(whole_in(0, 4096));
    add_output_flags(*cmd, args->out, {"text", "json", "md", "latex"});
    cmd->add_option("--method", args->method, "all-lengths method: auto, series, pairs, pairs-scalar, closure or zone-tail")
        ->check(one_of({"auto", "series", "pairs", "pairs-scalar", "closure", "zone-tail"}));
    cmd->add_option("--stop-after-pairs", args->stop_after,
                    "stop as if interrupted after this many new pairs (for batches and tests)")
        ->check(whole_in(0, 1'000'000'000'000));
    add_memory_limit(*cmd, args->memory_mib);
    cmd->add_flag("--plan", args->plan, "print the shard plan (shards, estimated work, ranks) on stderr before the work");
    auto* plan_only = cmd->add_flag("--plan-only", args->plan_only, "print the shard plan and stop: nothing is computed");
    cmd->add_option("--ranks", args->ranks, "with --plan-only outside mpirun: plan for this many ranks")
        ->needs(plan_only)
        ->check(whole_in(1, 100000));
    cmd->add_option("--progress-every", args->progress_every,
                    "print a progress line on stderr every this many seconds (under mpirun: one per rank)")
        ->check(real_in(0, 1e9, true));
    cmd->add_flag("--timings", args->timings, "under mpirun: print each rank's time and the imbalance on stderr");
    cmd->callback([args, cmd] {
        args->family = option_words(*cmd);
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
