// The overshoot command-line program: parses arguments, calls the library and
// hands results to render. Errors become one line on stderr and exit status 2.
#include <CLI/CLI.hpp>
#include <algorithm>
#include <cstdio>
#include <new>

#include "cli/registry.hpp"
#include "core/error.hpp"
#include "render/race.hpp"

namespace overshoot::cli {

std::vector<CommandEntry>& commands() {
    static std::vector<CommandEntry> list;
    return list;
}

int& exit_status() {
    static int status = 0;
    return status;
}

}  // namespace overshoot::cli

int main(int argc, char** argv) {
    using namespace overshoot;
    CLI::App app{"overshoot: exact analysis of race games where the finish must be hit exactly"};
    app.set_version_flag("--version", std::string("overshoot ") + render::version);
    app.require_subcommand(1);
    auto& list = cli::commands();
    std::sort(list.begin(), list.end(), [](const auto& a, const auto& b) { return a.order < b.order; });
    for (auto& c : list) c.setup(app);
    try {
        app.parse(argc, argv);
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        std::fprintf(stderr, "overshoot: error: %s (see --help)\n", e.what());
        return 2;
    } catch (const InternalError& e) {
        std::fprintf(stderr, "overshoot: internal error: %s\n", e.what());
        return 3;
    } catch (const InputError& e) {
        std::fprintf(stderr, "overshoot: error: %s\n", e.what());
        return 2;
    } catch (const std::bad_alloc&) {
        std::fprintf(stderr, "overshoot: error: out of memory (lower the input size or --memory-limit)\n");
        return 2;
    } catch (const std::exception& e) {
        std::fprintf(stderr, "overshoot: internal error: %s\n", e.what());
        return 3;
    }
    return cli::exit_status();
}
