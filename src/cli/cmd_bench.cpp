// overshoot bench: the fixed workload and its deterministic signature.
#include <fmt/format.h>

#include <memory>

#include "bench/bench.hpp"
#include "bench/peak.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"

namespace overshoot::cli {
namespace {

const Registration reg(900, [](CLI::App& app) {
    auto* cmd = app.add_subcommand("bench", "run the fixed benchmark workload; print its signature and times");
    set_usage(*cmd, "", "");
    auto verbose = std::make_shared<bool>(false);
    auto out = std::make_shared<OutputFlags>();
    auto peak = std::make_shared<bool>(false);
    cmd->add_flag("--verbose", *verbose, "also print the numbers that go into the signature");
    cmd->add_flag("--peak", *peak,
                  "also measure this core's vector peak (independent multiply-adds, no memory traffic)");
    add_output_flags(*cmd, *out, {"text"});
    cmd->callback([verbose, out, peak] {
        BenchReport r = run_bench();
        std::string text;
        for (const auto& it : r.items) {
            text += fmt::format("{:<50} {:>10.2f} ms", it.name, it.milliseconds);
            text += it.runs > 1 ? fmt::format("  (median of {} runs, fastest {:.2f} ms)\n", it.runs, it.fastest)
                                : std::string("\n");
            if (*verbose) text += fmt::format("    {}\n", it.result);
        }
        text += fmt::format("{:<50} {:>10.2f} ms\n", "total", r.total_milliseconds);
        text += fmt::format("signature {:016x}\n", r.signature);
        if (*peak) {
            const VectorPeak p = measure_vector_peak();
            text += fmt::format("vector peak of one core: {:.2f} G multiply-adds/s (product and sum rounded apart)",
                                p.separate);
            text += p.fused > 0 ? fmt::format(", {:.2f} G/s fused\n", p.fused) : std::string("\n");
        }
        deliver(*out, text);
    });
});

}  // namespace
}  // namespace overshoot::cli
