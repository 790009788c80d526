#pragma once
// The fixed benchmark workload. Its signature is a checksum of every result it
// computes (12 significant digits; duel probabilities to 12 decimal places,
// below which a remainder is rounding noise), so a changed number is never
// silent; every commit that touches computation quotes it.
#include <cstdint>
#include <string>
#include <vector>

namespace overshoot {

struct BenchItem {
    std::string name;
    double milliseconds = 0;  // the median of the runs
    std::string result;       // the numbers that went into the signature
    int runs = 1;             // short items run several times
    double fastest = 0;       // milliseconds of the fastest run
};

struct BenchReport {
    std::vector<BenchItem> items;
    std::uint64_t signature = 0;
    double total_milliseconds = 0;  // the sum of the items' medians
};

BenchReport run_bench();

}  // namespace overshoot
