#include "cli/search_flags.hpp"

#include <fmt/format.h>

#include "core/error.hpp"

namespace overshoot::cli {

SearchSpec search_spec_of(const Setup& s, const std::optional<std::string>& target,
                          const std::optional<std::string>& cycle, const std::string& prefix) {
    SearchSpec spec;
    spec.board = s.board;
    spec.order = s.order;
    spec.options = s.options;
    spec.starts = s.starts;
    spec.target = target ? parse_search_target(*target) : (cycle ? SearchTarget::cycle : SearchTarget::no_winner);
    if (cycle) spec.cycle = parse_cycle(*cycle, spec.options);
    if (spec.target == SearchTarget::cycle && !cycle)
        throw InputError(fmt::format("--{}target cycle needs the cycle: --{}cycle 'A > B > C > A'", prefix, prefix));
    return spec;
}

}  // namespace overshoot::cli
