// overshoot certify cycle|crossover|winner: writes a certificate a referee can re-check.
#include <fmt/format.h>

#include <cstdio>
#include <memory>

#include "certify/certificate.hpp"
#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "render/certificate.hpp"

namespace overshoot::cli {
namespace {

struct CertifyArgs {
    ClaimKind kind = ClaimKind::cycle;
    BoardFlags board;
    std::vector<std::string> specs;
    std::optional<int> at;
    OutputFlags out;
    int threads = 0;
    bool residual = false;
};

void run(const CertifyArgs& a) {
    BoardFlags flags = a.board;
    flags.head_starts_allowed = true;
    if (a.kind == ClaimKind::crossover) {
        if (!a.at) throw InputError("certify crossover: give --at LENGTH (the preference differs at LENGTH-1 and LENGTH)");
        if (flags.length && *flags.length != *a.at)
            throw InputError(fmt::format("certify crossover: --length {} differs from --at {}; give only --at", *flags.length, *a.at));
        flags.length = *a.at;
    }
    const std::size_t lo = a.kind == ClaimKind::cycle ? 3 : 2;
    const std::size_t hi = a.kind == ClaimKind::crossover ? 2 : 1000;
    Setup s = resolve_setup(flags, a.specs, lo, hi);
    Claim claim;
    claim.kind = a.kind;
    claim.at = a.at.value_or(0);
    for (const auto& o : s.options) claim.options.push_back(o.name);
    Certificate cert;
    try {
        cert = certify(claim, s.board, s.order, s.options, a.threads, a.residual, s.starts);
    } catch (const ClaimFailure& e) {
        std::fprintf(stderr, "overshoot: %s; no certificate written\n", e.what());
        exit_status() = 1;
        return;
    }
    const std::string format = a.out.chosen();
    const std::string text = format == "md"      ? render::certificate_markdown(cert)
                             : format == "latex" ? render::certificate_latex(cert)
                                                 : render::certificate_json(cert).dump(1) + "\n";
    deliver(a.out, text);
    // Written to a file, the certificate is out of sight: say so in one line (stdout stays empty).
    if (a.out.output && *a.out.output != "-")
        std::fprintf(stderr, "overshoot: %s\n", render::certificate_written(cert, *a.out.output, format == "json").c_str());
}

void add_kind(CLI::App& parent, const char* name, const char* help, ClaimKind kind) {
    auto args = std::make_shared<CertifyArgs>();
    args->kind = kind;
    auto* cmd = parent.add_subcommand(name, help);
    set_usage(*cmd, kind == ClaimKind::crossover ? "A B --at LENGTH" : "SPEC...", option_words_meaning);
    // Option words come from the leftovers: a declared positional would let
    // CLI11 split a custom die "[1,2,6]" into three words.
    cmd->allow_extras();
    add_board_flags(*cmd, args->board);
    if (kind == ClaimKind::crossover)
        cmd->add_option("--at", args->at, "the length where the preference has changed from LENGTH-1")
            ->check(whole_in(2, limits::max_length));
    // json is the certificate itself; md and latex are for people.
    add_output_flags(*cmd, args->out, {"json", "md", "latex"});
    cmd->add_option("--threads", args->threads, "threads to use (default: all cores)")->check(whole_in(0, 4096));
    cmd->add_flag("--residual", args->residual,
                  "on boards where pieces can move backward, prove intervals by a residual certificate even where "
                  "exact elimination fits");
    cmd->callback([args, cmd] {
        args->specs = option_words(*cmd);
        run(*args);
    });
}

const Registration reg(70, [](CLI::App& app) {
    auto* cmd = app.add_subcommand("certify", "write a certificate for a claim, with exact fractions and proven intervals");
    cmd->require_subcommand(1);
    set_usage(*cmd, "cycle|crossover|winner SPEC...", "the kind of claim, then its options (see overshoot certify KIND --help)");
    add_kind(*cmd, "cycle", "each option beats the next and the last beats the first", ClaimKind::cycle);
    add_kind(*cmd, "crossover", "the preference between A and B differs at LENGTH-1 and LENGTH", ClaimKind::crossover);
    add_kind(*cmd, "winner", "the first option beats every other option listed", ClaimKind::winner);
});

}  // namespace
}  // namespace overshoot::cli
