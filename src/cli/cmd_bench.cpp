// overshoot bench: the fixed workload and its deterministic signature.
#include <fmt/format.h>

#include <memory>

#include "bench/bench.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"

namespace overshoot::cli {
namespace {

const Registration reg(900, [](CLI::App& app) {
    auto* cmd = app.add_subcommand("bench", "run the fixed benchmark workload; print its signature and times");
    auto verbose = std::make_shared<bool>(false);
    cmd->add_flag("--verbose", *verbose, "also print the numbers that go into the signature");
    cmd->callback([verbose] {
        BenchReport r = run_bench();
        std::string out;
        for (const auto& it : r.items) {
            out += fmt::format("{:<42} {:>10.2f} ms\n", it.name, it.milliseconds);
            if (*verbose) out += fmt::format("    {}\n", it.result);
        }
        out += fmt::format("{:<42} {:>10.2f} ms\n", "total", r.total_milliseconds);
        out += fmt::format("signature {:016x}\n", r.signature);
        emit(out);
    });
});

}  // namespace
}  // namespace overshoot::cli
