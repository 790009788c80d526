#pragma once
// Helpers shared by the test files: options and chains from specs, and running the
// overshoot binary as a whole process (exit status, stdout, stderr).
#include <catch2/catch.hpp>
#include <sys/wait.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <initializer_list>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot::testing {

inline std::vector<Option> opts(std::initializer_list<const char*> specs) {
    std::vector<Option> out;
    for (const char* s : specs) out.push_back(parse_option(s));
    return out;
}

// Chains of several options on one board, and pointers to them (races).
struct Pieces {
    Board board;
    std::vector<Chain> chains;
    std::vector<const Chain*> ptr;
    Pieces(Board b, const std::vector<std::string>& specs) : board(std::move(b)) {
        for (const auto& s : specs) chains.push_back(build_chain(board, parse_option(s)));
        for (const auto& c : chains) ptr.push_back(&c);
    }
};

inline std::string slurp(const std::filesystem::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

struct Run {
    int status = -1;
    std::string out, err;
    int err_lines() const {
        int n = 0;
        for (char c : err) n += c == '\n';
        return n;
    }
    nlohmann::json json() const { return nlohmann::json::parse(out); }
};

// Runs a shell command line; its stderr goes through the file `err_file`.
inline Run run_shell(const std::string& command, const std::filesystem::path& err_file) {
    const std::string cmd = command + " 2>'" + err_file.string() + "'";
    Run r;
    FILE* p = ::popen(cmd.c_str(), "r");
    REQUIRE(p != nullptr);
    char buf[4096];
    std::size_t n;
    while ((n = std::fread(buf, 1, sizeof buf, p)) > 0) r.out.append(buf, n);
    const int st = ::pclose(p);
    r.status = WIFEXITED(st) ? WEXITSTATUS(st) : -1;
    r.err = slurp(err_file);
    return r;
}

}  // namespace overshoot::testing
