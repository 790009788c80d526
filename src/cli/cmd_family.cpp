// overshoot family FAMILY...: the options a family makes, before a long hunt:
// how many, which, and how many were merged as equal distributions.
#include <memory>

#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/family.hpp"
#include "render/family.hpp"

namespace overshoot::cli {
namespace {

struct FamilyArgs {
    std::vector<std::string> words;
    OutputFlags out;
};

void run(const FamilyArgs& a) {
    const FamilyOptions f = expand_families(a.words);
    const render::FamilyView view{&a.words, &f.options, f.merged};
    deliver(a.out, a.out.chosen() == "json" ? render::family_json(view).dump(2) : render::family_text(view));
}

const Registration reg(69, [](CLI::App& app) {
    auto args = std::make_shared<FamilyArgs>();
    auto* cmd = app.add_subcommand("family", "list the options a family makes (the options of a hunt), equal ones merged");
    set_usage(*cmd, "FAMILY...",
              "families such as dice(count=1..6, sides=4,6,8), custom(faces=6, values=0..6, sum=21), "
              "spinner(sectors=4, moves=1..5), @FILE or specs (docs/sweep.md, \"Families\")");
    // Family words verbatim from the extras: CLI11 would split them at commas.
    cmd->allow_extras();
    add_output_flags(*cmd, args->out, {"text", "json"});
    cmd->callback([args, cmd] {
        args->words = option_words(*cmd);
        if (args->words.empty()) throw InputError("family: give a family, e.g. 'custom(faces=6, values=0..6, sum=21)'");
        run(*args);
    });
});

}  // namespace
}  // namespace overshoot::cli
