#pragma once
// The fixed benchmark workload. Its signature is a checksum of every result it
// computes (rounded to 12 significant digits), so a changed number is never
// silent; every commit that touches computation quotes it.
#include <cstdint>
#include <string>
#include <vector>

namespace overshoot {

struct BenchItem {
    std::string name;
    double milliseconds = 0;
    std::string result;  // the numbers that went into the signature
};

struct BenchReport {
    std::vector<BenchItem> items;
    std::uint64_t signature = 0;
    double total_milliseconds = 0;
};

BenchReport run_bench();

}  // namespace overshoot
