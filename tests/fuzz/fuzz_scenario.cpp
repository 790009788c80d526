// libFuzzer target: the scenario loader (core/scenario.hpp), then the board
// and option validation a command applies to what it loaded. Bad input must
// end in InputError, never a crash or another exception.
#include <cstdint>
#include <string>

#include "core/board.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "core/scenario.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size > 65536) return 0;
    std::string text(reinterpret_cast<const char*>(data), size);
    try {
        overshoot::Scenario sc = overshoot::parse_scenario(text, "fuzz.toml");
        try {
            overshoot::Board b = overshoot::make_board(sc.length.value_or(100), sc.rule.value_or(overshoot::Overshoot::stay),
                                                       sc.jumps.value_or(std::vector<overshoot::Jump>{}));
            (void)b;
        } catch (const overshoot::InputError&) {
        }
        for (const auto& o : sc.options) {
            try {
                (void)overshoot::parse_option(o.spec, o.name);
            } catch (const overshoot::InputError&) {
            }
        }
    } catch (const overshoot::InputError&) {
    }
    return 0;
}
