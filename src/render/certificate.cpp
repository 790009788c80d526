#include "render/certificate.hpp"

#include <fmt/format.h>

#include "core/fraction.hpp"
#include "race/exact.hpp"
#include "render/document.hpp"
#include "render/format.hpp"

namespace overshoot::render {

namespace {

nlohmann::json value_json(const CertValue& v) {
    nlohmann::json j;
    if (v.exact) j["exact"] = fraction_string(*v.exact);
    j["decimal"] = v.decimal;
    j["interval"] = {v.lo, v.hi};
    return j;
}

const char* value_names[] = {"p_a_wins", "p_b_wins", "p_tie", "p_neither", "margin"};

nlohmann::json residual_json(const ResidualProof& r) {
    nlohmann::json parts = nlohmann::json::array();
    for (const ResidualPart& p : r.parts) {
        auto list = [](const std::vector<mpz_class>& v, int digits) {
            nlohmann::json out = nlohmann::json::array();
            for (const mpz_class& x : v) out.push_back(scaled_decimal(x, digits));
            return out;
        };
        nlohmann::json states = nlohmann::json::array();
        for (const auto& [a, b] : p.states) states.push_back({a, b});
        nlohmann::json j = {{"first", std::string(to_string(p.first))}, {"digits", p.digits}, {"states", states},
                            {"p_a_wins", list(p.p_a_wins, p.digits)}, {"p_b_wins", list(p.p_b_wins, p.digits)},
                            {"rounds", list(p.rounds, r.rounds_digits)}};
        if (p.first == Mover::both) j["p_tie"] = list(p.p_tie, p.digits);
        parts.push_back(j);
    }
    return {{"rounds_digits", r.rounds_digits}, {"parts", parts}};
}

const CertValue& value_of(const CertDuel& d, int i) {
    switch (i) {
        case 0: return d.p_a_wins;
        case 1: return d.p_b_wins;
        case 2: return d.p_tie;
        case 3: return d.p_neither;
        default: return d.margin;
    }
}

std::string verdict_words(const CertDuel& d) {
    switch (d.verdict) {
        case Verdict::a_beats_b: return d.a + " beats " + d.b;
        case Verdict::b_beats_a: return d.b + " beats " + d.a;
        // An exact margin of 0 is known: the two are even, not undecided.
        case Verdict::undecided: return d.margin.exact && sgn(*d.margin.exact) == 0 ? "even (exact margin 0)" : "undecided";
    }
    return "";
}

std::string distribution(const Option& o) {
    std::string s;
    for (int m = 0; m <= o.max_move(); ++m)
        if (o.weight[m]) s += fmt::format("{}{}:{}", s.empty() ? "" : ", ", m, o.weight[m]);
    return fmt::format("{{{}}} / {}", s, o.denominator);
}

// A long fraction shortened for a table: leading and trailing digits and the lengths.
std::string short_fraction(const mpq_class& q) {
    auto cut = [](const std::string& s) {
        std::size_t digits = s.size() - (s[0] == '-' ? 1 : 0);
        if (digits <= 24) return s;
        return fmt::format("{}...{} ({} digits)", s.substr(0, s.size() - digits + 10), s.substr(s.size() - 6), digits);
    };
    return cut(q.get_num().get_str()) + " / " + cut(q.get_den().get_str());
}

std::string wrapped(const std::string& s, std::size_t width) {
    std::string out;
    for (std::size_t i = 0; i < s.size(); i += width) out += s.substr(i, width) + "\n";
    return out;
}

const char* titles[] = {"P(A wins)", "P(B wins)", "P(tie)", "P(neither)", "margin"};

}  // namespace

nlohmann::json certificate_json(const Certificate& c) {
    nlohmann::json j = document("certificate", 1);
    nlohmann::json claim = {{"kind", std::string(to_string(c.claim.kind))}, {"options", c.claim.options},
                            {"statement", c.statement}};
    if (c.claim.kind == ClaimKind::crossover) claim["at"] = c.claim.at;
    j["claim"] = claim;
    nlohmann::json jumps = nlohmann::json::array();
    for (const Jump& jp : c.board.jumps) jumps.push_back({jp.from, jp.to});
    j["board"] = {{"length", c.board.length}, {"overshoot", std::string(to_string(c.board.rule))},
                  {"jumps", jumps}, {"order", std::string(to_string(c.order))}};
    if (any_head_start(c.starts)) {
        std::vector<std::string> names;
        for (const Option& o : c.options) names.push_back(o.name);
        j["board"]["head_starts"] = head_starts_json(names, c.starts);
    }
    nlohmann::json opts = nlohmann::json::array();
    for (const Option& o : c.options) {
        nlohmann::json moves = nlohmann::json::array();
        for (int m = 0; m <= o.max_move(); ++m)
            if (o.weight[m]) moves.push_back({m, o.weight[m]});
        opts.push_back({{"name", o.name}, {"spec", o.spec}, {"denominator", o.denominator}, {"moves", moves}});
    }
    j["options"] = opts;
    nlohmann::json duels = nlohmann::json::array();
    for (const CertDuel& d : c.duels) {
        nlohmann::json e = {{"a", d.a}, {"b", d.b}, {"length", d.length}, {"verdict", std::string(to_string(d.verdict))},
                            {"interval_method", d.interval_method}};
        e["exact_method"] = d.exact_method.empty() ? nlohmann::json(nullptr) : nlohmann::json(d.exact_method);
        for (int i = 0; i < 5; ++i) e[value_names[i]] = value_json(value_of(d, i));
        if (d.residual) e["residual"] = residual_json(*d.residual);
        duels.push_back(e);
    }
    j["duels"] = duels;
    j["how_to_check"] =
        "overshoot check FILE (exit 0: holds, 1: a claim or number fails, 2: unreadable); "
        "independently: python3 tools/referee.py FILE (docs/certificate.md)";
    return j;
}

std::string certificate_markdown(const Certificate& c) {
    std::string out = fmt::format("# Certificate ({})\n\n**Claim.** {}.\n\n", to_string(c.claim.kind), md_escape(c.statement));
    out += "**Options** (moves per turn, integer weights over the denominator):\n\n| option | spec | distribution |\n|---|---|---|\n";
    for (const Option& o : c.options) out += fmt::format("| {} | `{}` | {} |\n", md_escape(o.name), o.spec, distribution(o));
    out += "\n**Duels** (decimals to 6 places, exact values rounded; margin = P(A wins) - P(B wins)):\n\n";
    out += "| A | B | squares | P(A wins) | P(B wins) | P(tie) | P(neither) | margin | verdict | method |\n";
    out += "|---|---|---:|---:|---:|---:|---:|---:|---|---|\n";
    for (const CertDuel& d : c.duels)
        out += fmt::format("| {} | {} | {} | {} | {} | {} | {} | {} | {} | {} |\n", md_escape(d.a), md_escape(d.b), d.length, d.p_a_wins.decimal,
                           d.p_b_wins.decimal, d.p_tie.decimal, d.p_neither.decimal, d.margin.decimal, verdict_words(d),
                           d.exact_method.empty() ? "proven interval (" + d.interval_method + ")" : d.exact_method);
    out += "\n**Exact fractions** (shortened; the full values follow):\n\n| A | B | squares | value | fraction | proven interval |\n|---|---|---:|---|---|---|\n";
    for (const CertDuel& d : c.duels)
        for (int i = 0; i < 5; ++i) {
            const CertValue& v = value_of(d, i);
            out += fmt::format("| {} | {} | {} | {} | {} | [{:.17g}, {:.17g}] |\n", md_escape(d.a), md_escape(d.b), d.length, titles[i],
                               v.exact ? short_fraction(*v.exact) : "(no exact value)", v.lo, v.hi);
        }
    out += "\n## Full fractions\n";
    for (const CertDuel& d : c.duels) {
        if (d.exact_method.empty()) continue;
        out += fmt::format("\n### {} vs {} on {}\n", md_escape(d.a), md_escape(d.b), plural(d.length, "square"));
        for (int i = 0; i < 5; ++i) {
            const CertValue& v = value_of(d, i);
            out += fmt::format("\n{}:\n\n```\n{}```\n", titles[i], wrapped(fraction_string(*v.exact), 100));
        }
    }
    out += "\nRe-check with `overshoot check` on the JSON certificate, or with `tools/referee.py` (Python standard library).\n";
    return out;
}

std::string certificate_latex(const Certificate& c) {
    const auto tex = latex_escape;
    std::string out = "% Certificate written by overshoot " + std::string(version) + "; needs \\usepackage{booktabs}\n";
    out += fmt::format("\\paragraph{{Claim.}} {}.\n\n", tex(c.statement));
    out += "\\begin{tabular}{llrrrrrrl}\n\\toprule\n";
    out += "$A$ & $B$ & squares & $P(A\\text{ wins})$ & $P(B\\text{ wins})$ & $P(\\text{tie})$ & $P(\\text{neither})$ & margin & verdict \\\\\n\\midrule\n";
    for (const CertDuel& d : c.duels)
        out += fmt::format("{} & {} & {} & {} & {} & {} & {} & {} & {} \\\\\n", tex(d.a), tex(d.b), d.length, d.p_a_wins.decimal,
                           d.p_b_wins.decimal, d.p_tie.decimal, d.p_neither.decimal, d.margin.decimal, tex(verdict_words(d)));
    out += "\\bottomrule\n\\end{tabular}\n\n";
    out += "\\begin{tabular}{lllp{0.55\\textwidth}}\n\\toprule\n$A$ & $B$ & value & exact fraction (shortened) \\\\\n\\midrule\n";
    for (const CertDuel& d : c.duels)
        for (int i = 0; i < 5; ++i) {
            const CertValue& v = value_of(d, i);
            out += fmt::format("{} & {} & {} & \\texttt{{{}}} \\\\\n", tex(d.a), tex(d.b), tex(titles[i]),
                               v.exact ? tex(short_fraction(*v.exact)) : "(proven interval only)");
        }
    out += "\\bottomrule\n\\end{tabular}\n\n% Full fractions:\n";
    for (const CertDuel& d : c.duels) {
        if (d.exact_method.empty()) continue;
        for (int i = 0; i < 5; ++i) {
            out += fmt::format("% {} vs {} on {}, {}:\n", d.a, d.b, plural(d.length, "square"), titles[i]);
            std::string w = wrapped(fraction_string(*value_of(d, i).exact), 100);
            std::size_t pos = 0;
            while (pos < w.size()) {
                auto nl = w.find('\n', pos);
                out += "%   " + w.substr(pos, nl - pos) + "\n";
                pos = nl + 1;
            }
        }
    }
    return out;
}

std::string check_text(const Certificate& c, const CheckReport& r) {
    std::string out;
    for (const auto& p : r.passed) out += fmt::format("checked  {}: {}\n", p.item, p.detail);
    // The primes matter only where exact fractions were checked modulo them.
    bool fractions = false;
    for (const CertDuel& d : c.duels) fractions = fractions || !d.exact_method.empty();
    std::string primes;
    for (auto p : r.primes) primes += fmt::format("{}{}", primes.empty() ? "" : ", ", p);
    if (fractions && !primes.empty()) out += fmt::format("primes of the modular checks: {}\n", primes);
    if (r.holds)
        out += fmt::format("certificate holds: {}.\n", c.statement);
    else
        out += fmt::format("certificate FAILS: {}\n", r.failure);
    return out;
}

std::string certificate_written(const Certificate& c, const std::string& path, bool json) {
    if (!json)
        return fmt::format("certificate written to {}: {}. This form is for reading; `overshoot check` re-checks "
                           "the JSON form (--format json)",
                           path, c.statement);
    return fmt::format("certificate written to {}: {}. Re-check it with: overshoot check {}", path, c.statement, path);
}

nlohmann::json check_json(const Certificate& c, const CheckReport& r) {
    nlohmann::json j = document("check", 1);
    j["holds"] = r.holds;
    j["failure"] = r.holds ? nlohmann::json(nullptr) : nlohmann::json(r.failure);
    j["statement"] = c.statement;
    nlohmann::json items = nlohmann::json::array();
    for (const auto& p : r.passed) items.push_back({{"item", p.item}, {"detail", p.detail}});
    j["passed"] = items;
    j["primes"] = r.primes;
    return j;
}

}  // namespace overshoot::render
