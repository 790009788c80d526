// The overshoot command-line program: parses arguments, calls the library and
// hands results to render. Errors become one line on stderr and exit status 2.
#include <CLI/CLI.hpp>
#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <iostream>
#include <new>

#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "cli/registry.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "render/document.hpp"

#ifdef OVERSHOOT_HAVE_MPI
#include "hunt/mpi/ranks.hpp"
#endif

namespace overshoot::cli {

std::vector<CommandEntry>& commands() {
    static std::vector<CommandEntry> list;
    return list;
}

int& exit_status() {
    static int status = 0;
    return status;
}

namespace {

// One usage line per command, naming its positionals, and a line saying what
// they are (commands take their option words verbatim, not as CLI11 positionals).
class UsageFormatter : public CLI::Formatter {
  public:
    std::string make_usage(const CLI::App* app, std::string name) const override {
        const Usage* u = usage_of(app);
        if (!u) return CLI::Formatter::make_usage(app, name);
        return fmt::format("Usage: {}{}{}\n", name, u->positionals.empty() ? "" : " " + u->positionals,
                           app->get_options().empty() ? "" : " [OPTIONS]");
    }
    std::string make_positionals(const CLI::App* app) const override {
        const Usage* u = usage_of(app);
        if (!u) return CLI::Formatter::make_positionals(app);
        if (u->positionals.empty()) return {};
        return fmt::format("\nPositionals:\n  {:<{}}{}\n", u->positionals, get_column_width(), u->meaning);
    }
};

// A closed descriptor 0, 1 or 2 is held by a read-only /dev/null, so that no
// file opened later takes its number and every write to it fails (and is seen).
void hold_standard_descriptors() {
    for (int fd = 0; fd <= 2; ++fd)
        if (::fcntl(fd, F_GETFD) < 0 && errno == EBADF) {
            const int got = ::open("/dev/null", O_RDONLY);
            if (got >= 0 && got != fd) ::close(got);
        }
}

// Under mpirun every rank reads the same arguments and meets the same bad
// input: rank 0 alone says so (the launcher's environment names the rank, so
// this works before MPI starts and in a build without MPI).
bool quiet_rank() {
    for (const char* name : {"OMPI_COMM_WORLD_RANK", "PMIX_RANK", "PMI_RANK"})
        if (const char* v = std::getenv(name)) return std::string(v) != "0";
    return false;
}

// After the one line on bad input: under mpirun, every rank waits for rank 0's line.
void settle_ranks() {
#ifdef OVERSHOOT_HAVE_MPI
    if (cluster::launched_by_mpirun()) cluster::settle_before_exit();
#endif
}

// Stdout's last bytes and its close, checked: a lost result is an error.
int close_stdout(int status) {
    std::cout.flush();
    const bool bad = !std::cout || std::fflush(stdout) != 0 || std::ferror(stdout);
    const int err = errno;
    if (std::fclose(stdout) != 0 || bad) {
        std::fprintf(stderr, "overshoot: error: standard output: write failed (%s)\n",
                     std::strerror(bad ? err : errno));
        return status == 0 ? 2 : status;
    }
    return status;
}

}  // namespace
}  // namespace overshoot::cli

int main(int argc, char** argv) {
    using namespace overshoot;
    cli::hold_standard_descriptors();
    CLI::App app{"overshoot: exact analysis of race games where the finish must be hit exactly"};
    app.name("overshoot");
    app.formatter(std::make_shared<cli::UsageFormatter>());  // inherited by every subcommand made after it
    app.set_version_flag("--version", std::string("overshoot ") + render::version);
    app.require_subcommand(1);
    auto& list = cli::commands();
    std::sort(list.begin(), list.end(), [](const auto& a, const auto& b) { return a.order < b.order; });
    for (auto& c : list) c.setup(app);
    int status = 0;
    try {
        // A first word that is no flag must name a command: say which word is unknown.
        if (argc > 1 && argv[1][0] != '-') {
            std::vector<std::string> names;
            for (const auto* sub : app.get_subcommands([](CLI::App*) { return true; })) names.push_back(sub->get_name());
            if (std::find(names.begin(), names.end(), argv[1]) == names.end()) {
                const std::string near = cli::closest(argv[1], names);
                throw InputError(fmt::format("unknown command '{}'{} (see overshoot --help)", argv[1],
                                             near.empty() ? "" : fmt::format("; did you mean '{}'?", near)));
            }
        }
        app.parse(argc, argv);
        status = cli::exit_status();
    } catch (const CLI::CallForHelp& e) {
        status = app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        status = app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        status = app.exit(e);
    } catch (const CLI::ParseError& e) {
        if (!cli::quiet_rank())
            std::fprintf(stderr, "overshoot: error: %s (see --help)\n", escape_controls(cli::in_our_words(e)).c_str());
        cli::settle_ranks();
        status = 2;
    } catch (const InternalError& e) {
        std::fprintf(stderr, "overshoot: internal error: %s\n", escape_controls(e.what()).c_str());
        status = 3;
    } catch (const InputError& e) {
        // Messages quote what was typed: a control character in it never reaches the terminal raw.
        if (!cli::quiet_rank()) std::fprintf(stderr, "overshoot: error: %s\n", escape_controls(e.what()).c_str());
        cli::settle_ranks();
        status = 2;
    } catch (const std::bad_alloc&) {
        std::fprintf(stderr, "overshoot: error: out of memory (lower the input size or --memory-limit)\n");
        status = 2;
    } catch (const std::exception& e) {
        std::fprintf(stderr, "overshoot: internal error: %s\n", e.what());
        status = 3;
    }
    return cli::close_stdout(status);
}
