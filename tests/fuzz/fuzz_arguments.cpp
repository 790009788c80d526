// libFuzzer target: the command line's number and range parsers and the
// validators built on them (cli/arguments.hpp). Any input must be accepted
// or refused with a message; a crash, a sanitizer report, an exception or an
// accepted value outside its limits is a finding.
#include <cstdint>
#include <cstdlib>
#include <string>
#include <string_view>

#include "cli/arguments.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size > 256) return 0;  // arguments are typed by hand
    const std::string text(reinterpret_cast<const char*>(data), size);
    using namespace overshoot;
    using namespace overshoot::cli;
    if (auto v = whole_number(text)) {
        if (whole_number(std::to_string(*v)) != v) std::abort();
    }
    if (auto r = number_range(text)) {
        if (text.find("..") == std::string::npos && r->first != r->second) std::abort();
    }
    std::string s = text;
    if (whole_in(1, 1'000'000)(s).empty()) {
        auto v = whole_number(s);
        if (!v || *v < 1 || *v > 1'000'000) std::abort();
    }
    s = text;
    if (range_in(0, 1'000'000)(s).empty()) {
        auto r = number_range(s);
        if (!r || r->first < 0 || r->second > 1'000'000 || r->first > r->second) std::abort();
    }
    s = text;
    if (real_in(0, 1, true)(s).empty()) {
        const double v = std::strtod(s.c_str(), nullptr);
        if (!(v > 0 && v < 1)) std::abort();
    }
    s = text;
    (void)one_of({"stay", "bounce", "pass"})(s);
    (void)closest(text, {"profile", "duel", "race", "sweep", "hunt"});
    return 0;
}
