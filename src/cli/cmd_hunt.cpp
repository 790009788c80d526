// overshoot hunt FAMILY...: search a family of options over lengths and rule
// variants for intransitive sets (cycles) of a wanted size and strength.
#include <fmt/format.h>
#include <unistd.h>

#include <csignal>
#include <cstdio>
#include <memory>
#include <mutex>
#include <optional>

#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "core/limits.hpp"
#include "render/sweep.hpp"
#include "sweep/family.hpp"
#include "sweep/hunt.hpp"

namespace overshoot::cli {

std::vector<std::string> split_list(const std::vector<std::string>& values);
std::vector<Variant> variants_from(const std::vector<std::string>& rules, const std::vector<std::string>& orders,
                                   Overshoot default_rule, Order default_order);

namespace {

std::atomic<bool> interrupted{false};

extern "C" void on_sigint(int) {
    interrupted.store(true);
    std::signal(SIGINT, SIG_DFL);  // a second Ctrl-C ends the program at once
}

struct HuntArgs {
    std::vector<std::string> family;
    std::string lengths;
    int step = 1;
    std::vector<std::string> rules, orders;
    int cycle_length = 3;
    double min_strength = 0;
    std::optional<std::string> require;
    long long list = 100;
    std::optional<std::string> checkpoint;
    bool resume = false;
    int threads = 0;
    bool json = false;
    std::string method = "auto";
    long long stop_after = -1;
    std::optional<long long> memory_mib;
    std::optional<std::string> output;
};

void run(const HuntArgs& a) {
    if (a.threads < 0) throw InputError("--threads must be 0 (all cores) or more");
    if (a.lengths.empty()) throw InputError("no lengths: give --lengths LO..HI");
    if (a.list < 1) throw InputError("--list must be at least 1");
    if (a.memory_mib) {
        if (*a.memory_mib < 1) throw InputError("--memory-limit must be at least 1 MiB");
        limits::set_memory_bytes(static_cast<std::uint64_t>(*a.memory_mib) << 20);
    }
    HuntSpec spec;
    spec.options = parse_families(a.family);
    spec.grid = parse_lengths(a.lengths, a.step);
    spec.variants = variants_from(a.rules, a.orders, Overshoot::stay, Order::simultaneous);
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
    const bool bar = ::isatty(2) != 0;
    std::mutex bar_mutex;
    if (bar)
        spec.progress = [&](std::size_t done, std::size_t total) {
            std::lock_guard<std::mutex> lock(bar_mutex);
            const int width = 30;
            const int filled = total ? static_cast<int>(width * done / total) : width;
            std::fprintf(stderr, "\r[%s%s] %zu/%zu pairs", std::string(filled, '#').c_str(),
                         std::string(width - filled, '.').c_str(), done, total);
            std::fflush(stderr);
        };
    std::signal(SIGINT, on_sigint);
    HuntResult r = run_hunt(spec);
    std::signal(SIGINT, SIG_DFL);
    if (bar) std::fprintf(stderr, "\r%60s\r", "");
    std::string out = a.json ? render::hunt_json(r, spec).dump(2) + "\n" : render::hunt_text(r, spec);
    if (a.output)
        write_atomically(*a.output, out);
    else
        emit(out);
    if (!r.complete) {
        std::fprintf(stderr, "overshoot: hunt interrupted: %zu of %zu pairs known%s\n", r.pairs_known, r.pairs_total,
                     spec.checkpoint.empty() ? "" : "; continue with --resume");
        exit_status() = 130;
    }
}

const Registration reg(70, [](CLI::App& app) {
    auto args = std::make_shared<HuntArgs>();
    auto* cmd = app.add_subcommand("hunt", "search a family of options over lengths and rules for intransitive sets");
    // Family words come from the leftovers so that CLI11 never splits
    // "1..6d{4,6,8}" or "[0,3,3,5]" at its commas.
    cmd->allow_extras();
    cmd->add_option("--lengths", args->lengths, "range of lengths LO..HI");
    cmd->add_option("--step", args->step, "step between lengths (default 1)");
    cmd->add_option("--overshoot", args->rules, "rule(s): stay, bounce, pass; repeat or comma-separate");
    cmd->add_option("--order", args->orders, "turn order(s): simultaneous, coin; repeat or comma-separate");
    cmd->add_option("--cycle-length", args->cycle_length, "options in a wanted cycle (default 3)");
    cmd->add_option("--min-strength", args->min_strength, "smallest margin of a wanted cycle, as a probability (e.g. 0.01)");
    cmd->add_option("--require", args->require, "an option name every wanted cycle contains");
    cmd->add_option("--list", args->list, "most sets listed (default 100; the totals count all)");
    cmd->add_option("--checkpoint", args->checkpoint, "keep finished work in this file (written atomically)");
    cmd->add_flag("--resume", args->resume, "continue from --checkpoint without redoing finished pairs");
    cmd->add_option("--threads", args->threads, "threads (0: all cores; same output for any count)");
    cmd->add_flag("--json", args->json, "print one JSON document");
    cmd->add_option("--method", args->method, "all-lengths method: auto, series or pairs");
    cmd->add_option("--stop-after-pairs", args->stop_after,
                    "stop as if interrupted after this many new pairs (for batches and tests)");
    cmd->add_option("--memory-limit", args->memory_mib, "memory cap in MiB for one computation (default 4096)");
    cmd->add_option("--output", args->output, "write to this file (atomically) instead of stdout");
    cmd->callback([args, cmd] {
        args->family = option_words(*cmd);
        if (args->family.empty())
            throw InputError("hunt: give a family of options, e.g. '1..6d{4,6,8,10,12,20}' (docs/sweep.md)");
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
