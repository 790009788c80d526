// overshoot check FILE: re-derives every number of a certificate by other algorithms.
#include <fmt/format.h>

#include <cstdio>
#include <memory>

#include "certify/certificate.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "render/certificate.hpp"

namespace overshoot::cli {
namespace {

struct CheckArgs {
    std::string file;
    OutputFlags out;
    int threads = 0;
};

void run(const CheckArgs& a) {
    const std::string text = read_file(a.file);
    Certificate cert = parse_certificate(text, a.file);  // malformed: exit 2
    CheckReport rep = check_certificate(cert, text, a.threads);
    deliver(a.out, a.out.chosen() == "json" ? render::check_json(cert, rep).dump(2) : render::check_text(cert, rep));
    if (!rep.holds) {
        std::fprintf(stderr, "overshoot: %s: certificate fails: %s\n", a.file.c_str(), rep.failure.c_str());
        exit_status() = 1;
    }
}

const Registration reg(71, [](CLI::App& app) {
    auto args = std::make_shared<CheckArgs>();
    auto* cmd = app.add_subcommand("check", "re-check a certificate: exit 0 when it holds, 1 when it fails, 2 when unreadable");
    cmd->add_option("FILE", args->file, "the certificate (JSON)")->required();
    add_output_flags(*cmd, args->out, {"text", "json"});
    cmd->add_option("--threads", args->threads, "threads to use (default: all cores)")->check(whole_in(0, 4096));
    cmd->callback([args] { run(*args); });
});

}  // namespace
}  // namespace overshoot::cli
